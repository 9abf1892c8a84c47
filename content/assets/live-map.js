/* Ridgeline: the study page's interactive map. Leaflet (bundled with the site, no tile server):
   a hillshade and coverage overlays placed by their corners, sites, and links coloured by
   verdict with a popup linking to the link page. Works from file:// and under a path prefix:
   every path is relative to the study folder given in data-base. */
(function () {
  "use strict";
  var COLOURS = { met: "#2e7d32", missed: "#c62828", alternative: "#757575", rejected: "#757575" };
  var LABELS = { met: "meets its design targets", missed: "misses a design target", alternative: "alternative design (not in the verdict)", rejected: "rejected design (not in the verdict)" };
  function text(s) {
    var d = document.createElement("div");
    d.textContent = s;
    return d.innerHTML;
  }
  // the same for an attribute value quoted with "
  function attr(s) {
    return text(s).replace(/"/g, "&quot;");
  }
  function init(el) {
    if (typeof L === "undefined") return;
    var dataEl = document.getElementById(el.getAttribute("data-map"));
    if (!dataEl) return;
    var data = JSON.parse(dataEl.textContent);
    // the study folder, relative to this page ("…/index.html" with the file name dropped)
    var base = (el.getAttribute("data-base") || "").replace(/index\.html$/, "");
    var map = L.map(el, { zoomSnap: 0.25, attributionControl: false, scrollWheelZoom: false });
    map.fitBounds(data.bounds);
    var overlays = {};
    if (data.hillshade) {
      var shade = L.imageOverlay(data.hillshade.href, data.hillshade.bounds, { opacity: 1, className: "map-hillshade" }).addTo(map);
      overlays[data.hillshade.label] = shade;
    }
    data.coverage.forEach(function (c) {
      overlays[c.label] = L.imageOverlay(base + c.href, c.bounds, { opacity: 0.75, className: "map-coverage map-coverage-" + c.id });
    });
    var links = L.layerGroup().addTo(map);
    data.links.forEach(function (l) {
      var line = L.polyline([l.from, l.to], { color: COLOURS[l.verdict] || "#333", weight: 4, dashArray: l.verdict === "met" ? null : "8 6", className: "map-link map-link-" + l.verdict });
      line.bindPopup('<strong class="link-id">' + text(l.id) + "</strong><br>" + text(l.label) + "<br>" + text(LABELS[l.verdict] || l.verdict) + '<br><a href="' + attr(base + l.href) + '">Link page</a>');
      line.addTo(links);
    });
    var sites = L.layerGroup().addTo(map);
    data.sites.forEach(function (s) {
      L.circleMarker([s.lat, s.lon], { radius: 6, color: "#1b2430", weight: 2, fillColor: "#fff", fillOpacity: 1, className: "map-site" })
        .bindTooltip(text(s.id + " · " + s.name), { direction: "top", offset: [0, -6] })
        .addTo(sites);
    });
    overlays["Links"] = links;
    overlays["Sites"] = sites;
    L.control.layers(null, overlays, { collapsed: false }).addTo(map);
    L.control.scale({ imperial: false }).addTo(map);
    var fig = el.closest("section, main");
    if (fig) fig.classList.add("has-live-map");
    el.setAttribute("data-ready", "true");
  }
  var els = document.querySelectorAll(".live-map[data-map]");
  for (var i = 0; i < els.length; i++) init(els[i]);
})();
