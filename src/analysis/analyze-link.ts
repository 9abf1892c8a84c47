import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { geodesicPath } from "../geo/geodesic-path.ts";
import { EARTH_RADIUS_M, wavelengthM } from "../physics/constants.ts";
import { freeSpaceLossDb } from "../physics/free-space-loss.ts";
import { InputError } from "../study/input-error.ts";
import type { Study } from "../study/study.ts";
import type { Terrain } from "../terrain/terrain.ts";
import { parseProfileCsv } from "../terrain/profile-csv.ts";
import { effectiveK999, KE_999_CLEARANCE_F1, KE_999_VALIDITY } from "../physics/effective-k-worst-month.ts";
import { pathClearance } from "./clearance.ts";
import { endLosses } from "./end-losses.ts";
import { rangeWarning } from "./range-warning.ts";
import { minimumAntennaHeights } from "./minimum-heights.ts";
import { obstructedHeights } from "./link-losses.ts";
import { MAX_PROFILE_SAMPLES, profileStepM, terrainProfile, type LinkProfile } from "./link-profile.ts";
import { minimumLinkLengthM } from "../study/load-study.ts";

/** Ground heights accepted from a terrain (m amsl): the Dead Sea shore to above Everest, as for ground_m. */
export const GROUND_MIN_M = -500;
export const GROUND_MAX_M = 9000;

/** A terrain coarser than this fraction of the path (spacing > path / N) makes the clearance verdict unreliable. */
export const COARSE_TERRAIN_FRACTION = 10;
import type { ClearanceRow, LinkEndResult, LinkResult } from "./results.ts";
import { linkLosses } from "./link-losses.ts";
import type { HeightGainCurve } from "./link-reflection.ts";
import type { WaveFigureData } from "./link-wave.ts";
import { applyLinkWave, solveLinkWave, type LinkWaveJob } from "./link-wave-job.ts";

type LinkInput = Study["links"][number];

/** What the report needs to draw a link beyond its JSON result. */
export interface LinkFigureData {
  profile: LinkProfile;
  lambda_m: number;
  ks: { label: string; ae_m: number; worst: { at_distance_m: number; clearance_f1: number } }[];
  /** The height-gain curve at the receiving end (a plot series; results carry its step). */
  height_gain: HeightGainCurve;
  /** The wave solution's field and height-gain curve (link-wave.ts); absent when not computed. */
  wave?: WaveFigureData;
}

/** Heights of a site's ground: the study's surveyed value, else the terrain under it. */
export function siteGroundM(site: Study["sites"][number], terrain: Terrain): number {
  return site.ground_m ?? terrain.elevation(site.lat_deg, site.lon_deg);
}

/**
 * Analyse one link: geodesic, profile, clearance at each design k, free-space loss, then the
 * losses, budget and availability. Pure computation on already validated inputs.
 * @param options.pathOf samples the geodesic (default geodesicPath; a build with a cache
 *   passes one that remembers paths, memo-geodesic.ts)
 * @param options.deferWave leave the wave solution out and return what it is computed from
 *   (`wave`), for the caller to solve elsewhere (wave-pool.ts) and put in with applyLinkWave
 */
export function analyzeLink(study: Study, link: LinkInput, terrain: Terrain, options: { pathOf?: typeof geodesicPath; deferWave?: boolean } = {}): { result: LinkResult; figure: LinkFigureData; wave?: LinkWaveJob } {
  const pathOf = options.pathOf ?? geodesicPath;
  const warnings: string[] = [];
  let clearance_reliable = true;
  const radio = study.radios.find((r) => r.id === link.radio)!;
  const siteA = study.sites.find((s) => s.id === link.from.site)!;
  const siteB = study.sites.find((s) => s.id === link.to.site)!;
  const geo = geodesicPath(siteA.lat_deg, siteA.lon_deg, siteB.lat_deg, siteB.lon_deg, Infinity); // the ends only: cheaper than a cache lookup
  let profile: LinkProfile;
  if (link.profile_csv) {
    const csvPath = resolve(study.dir, link.profile_csv);
    const csv = parseProfileCsv(readFileSync(csvPath, "utf8"), csvPath);
    const n = csv.d_m.length;
    profile = {
      source: `surveyed: ${link.profile_csv}`,
      d_m: csv.d_m,
      terrain_m: csv.h_m,
      obstruction_m: csv.obstruction_m,
      step_m: n > 1 ? csv.d_m[n - 1] / (n - 1) : 0,
      void_filled: 0,
      outside: 0,
    };
    const len = csv.d_m[n - 1];
    if (Math.abs(len - geo.distance_m) > Math.max(50, 0.01 * geo.distance_m)) {
      warnings.push(`The surveyed profile is ${(len / 1000).toFixed(3)} km long but the sites are ${(geo.distance_m / 1000).toFixed(3)} km apart; the profile is used as given.`);
    }
    if (!(len >= minimumLinkLengthM(radio.frequency_ghz))) {
      throw new InputError([
        {
          file: study.file,
          ...study.locate(["links", link.index, "profile_csv"]),
          field: `links[${link.index}].profile_csv (${link.id})`,
          received: `a surveyed profile ${len} m long`,
          expected: `a profile at least ${minimumLinkLengthM(radio.frequency_ghz).toPrecision(3)} m long (ten wavelengths and 1 m), as long as the path`,
        },
      ]);
    }
  } else {
    const native_m = terrain.resolutionM((siteA.lat_deg + siteB.lat_deg) / 2);
    const step_m = profileStepM(geo.distance_m, native_m, study.design.profile_step_m);
    if (!(geo.distance_m / step_m <= MAX_PROFILE_SAMPLES)) {
      const given = study.design.profile_step_m !== undefined;
      throw new InputError([
        {
          file: study.file,
          ...study.locate(given ? ["design", "profile_step_m"] : ["links", link.index]),
          field: given ? `design.profile_step_m (link ${link.id})` : `links[${link.index}] (${link.id})`,
          received: `a profile of ${Math.ceil(geo.distance_m / step_m)} samples (${(geo.distance_m / 1000).toFixed(3)} km at ${step_m} m)`,
          expected: `at most ${MAX_PROFILE_SAMPLES} samples: a profile_step_m of at least ${(geo.distance_m / MAX_PROFILE_SAMPLES).toPrecision(3)} m for this path`,
        },
      ]);
    }
    if (Number.isFinite(native_m) && native_m > geo.distance_m / COARSE_TERRAIN_FRACTION) {
      warnings.push(
        `Clearance verdict unreliable: the terrain's spacing (${native_m.toFixed(0)} m) is coarser than a ${COARSE_TERRAIN_FRACTION}th of the path (${geo.distance_m.toFixed(0)} m), so the profile holds fewer than ${COARSE_TERRAIN_FRACTION} independent ground heights and obstacles between them are not seen; use finer terrain or a surveyed profile.`,
      );
      clearance_reliable = false;
    }
    const sampled = terrainProfile([siteA.lat_deg, siteA.lon_deg], [siteB.lat_deg, siteB.lon_deg], terrain, study.design.profile_step_m, pathOf);
    profile = sampled.profile;
    if (profile.outside > 0) {
      const i = profile.terrain_m.findIndex((h) => Number.isNaN(h));
      const why = terrain.whyOutside(sampled.geo.lat_deg[i], sampled.geo.lon_deg[i]) ?? "the terrain has no data there";
      throw new InputError([
        {
          file: study.file,
          ...study.locate(["links", link.index]),
          field: `links[${link.index}] (${link.id})`,
          received: `a path that leaves the terrain ${(profile.d_m[i] / 1000).toFixed(2)} km from ${siteA.id}`,
          expected: `a path covered by the terrain: ${why}`,
        },
      ]);
    }
    const bad = profile.terrain_m.findIndex((h) => !(h >= GROUND_MIN_M && h <= GROUND_MAX_M));
    if (bad >= 0) {
      throw new InputError([
        {
          file: study.file,
          ...study.locate(["terrain"]),
          field: `terrain (link ${link.id})`,
          received: `a ground height of ${profile.terrain_m[bad]} m ${(profile.d_m[bad] / 1000).toFixed(2)} km from ${siteA.id}`,
          expected: `terrain heights from ${GROUND_MIN_M} to ${GROUND_MAX_M} m: the DEM holds values that are not heights (declare its nodata value, e.g. gdal_translate -a_nodata)`,
        },
      ]);
    }
    if (profile.void_filled > 0) warnings.push(`${profile.void_filled} profile samples fall on DEM voids that were filled by interpolation.`);
  }
  const n = profile.d_m.length;
  const D = profile.d_m[n - 1];
  const end = (e: LinkInput["from"], site: Study["sites"][number], h: number): LinkEndResult => {
    const ground_m = site.ground_m ?? h;
    if (site.ground_m !== undefined && Number.isFinite(h) && Math.abs(site.ground_m - h) > 10) {
      warnings.push(`Site ${site.id}: surveyed ground ${site.ground_m} m differs from the profile's ${h.toFixed(1)} m by more than 10 m.`);
    }
    const eirp_dbm = radio.tx_power_dbm - endLosses(e).total_db + e.gain_dbi;
    return { site: site.id, name: site.name, ground_m, antenna_m: e.antenna_m, antenna_amsl_m: ground_m + e.antenna_m, gain_dbi: e.gain_dbi, feeder_loss_db: e.feeder_loss_db, eirp_dbm };
  };
  const from = end(link.from, siteA, profile.terrain_m[0]);
  const to = end(link.to, siteB, profile.terrain_m[n - 1]);
  for (const [e, site, h, which] of [[from, siteA, profile.terrain_m[0], "from"], [to, siteB, profile.terrain_m[n - 1], "to"]] as const) {
    if (e.antenna_amsl_m < h) {
      const i = study.sites.indexOf(site);
      throw new InputError([
        {
          file: study.file,
          ...study.locate(["sites", i, "ground_m"]),
          field: `sites[${i}].ground_m (${site.id}, link ${link.id} ${which} end)`,
          received: `${site.ground_m} m, which puts the antenna at ${e.antenna_amsl_m.toFixed(1)} m amsl, below the profile's ground of ${h.toFixed(1)} m there`,
          expected: "a surveyed ground height that agrees with the terrain or profile at the site, or no ground_m (the terrain's height is used)",
        },
      ]);
    }
  }
  const lambda_m = wavelengthM(radio.frequency_ghz);
  const required = new Map(study.design.clearance_criteria.map((c) => [c.k.k, c.min_f1]));
  const ks: LinkFigureData["ks"] = [];
  // The automatic case: k_e exceeded 99.9 % of the worst month for this path length (P.530-16 §2.2.2).
  const wm = study.design.worst_month_k ?? { enabled: true, min_f1: KE_999_CLEARANCE_F1.extended };
  const ke = wm.enabled ? effectiveK999(D / 1000) : NaN;
  const auto = Number.isFinite(ke) ? { k: ke, label: `${ke.toFixed(2)} (k_e 99.9 % worst month)`, min_f1: wm.min_f1 } : null;
  if (auto) {
    warnings.push(...[rangeWarning(KE_999_VALIDITY.method, "path length", D / 1000, KE_999_VALIDITY.distance_km, "km")].filter((w): w is string => w !== null));
  }
  const kCases = [...study.design.k_factors.map((kf) => ({ ...kf, automatic: undefined as string | undefined })), ...(auto ? [{ k: auto.k, label: auto.label, automatic: `${KE_999_VALIDITY.method}: k_e exceeded for 99.9 % of the worst month on a ${(D / 1000).toFixed(1)} km path, with ${auto.min_f1} F1 required (design.worst_month_k)` }] : [])];
  const clearance: ClearanceRow[] = kCases.map((kf) => {
    const ae_m = kf.k * EARTH_RADIUS_M;
    const c = pathClearance({ d_m: profile.d_m, terrain_m: profile.terrain_m, obstruction_m: profile.obstruction_m, hts_m: from.antenna_amsl_m, hrs_m: to.antenna_amsl_m, lambda_m, ae_m });
    ks.push({ label: kf.label, ae_m, worst: { at_distance_m: c.at_distance_m, clearance_f1: c.min_clearance_f1 } });
    const req = kf.automatic && auto ? auto.min_f1 : required.get(kf.k);
    return {
      k: Number.isFinite(kf.k) ? kf.k : "inf",
      k_label: kf.label,
      min_clearance_f1: c.min_clearance_f1,
      at_distance_m: c.at_distance_m,
      clearance_m: c.clearance_m,
      f1_m: c.f1_m,
      required_f1: req ?? null,
      met: req === undefined ? null : c.min_clearance_f1 >= req,
      ...(kf.automatic ? { automatic: kf.automatic } : {}),
    };
  });
  for (const c of study.design.clearance_criteria) {
    if (!study.design.k_factors.some((k) => k.k === c.k.k)) warnings.push(`Clearance criterion for k = ${c.k.label} is not checked: that k is not in design.k_factors.`);
  }
  const clearance_met = clearance.every((c) => c.met !== false);
  const search = study.design.antenna_search;
  const minimum = minimumAntennaHeights({
    d_m: profile.d_m,
    ground_m: obstructedHeights(profile),
    from_ground_m: from.ground_m,
    to_ground_m: to.ground_m,
    lambda_m,
    criteria: [...study.design.clearance_criteria.map((c) => ({ ae_m: c.k.k * EARTH_RADIUS_M, min_f1: c.min_f1 })), ...(auto ? [{ ae_m: auto.k * EARTH_RADIUS_M, min_f1: auto.min_f1 }] : [])],
    step_m: search.step_m,
    max_m: search.max_m,
  });
  if (!minimum) warnings.push(`No pair of antenna heights up to ${search.max_m} m meets the clearance criteria.`);
  const base: LinkResult = {
    id: link.id,
    from: siteA.id,
    to: siteB.id,
    radio: radio.id,
    radio_name: radio.name ?? radio.id,
    threshold_ber: radio.threshold_ber,
    frequency_ghz: radio.frequency_ghz,
    polarization: link.polarization,
    distance_m: geo.distance_m,
    azimuth_from_deg: geo.azimuth_from_deg,
    azimuth_to_deg: geo.azimuth_to_deg,
    ends: { from, to },
    profile: { source: profile.source, samples: n, step_m: profile.step_m },
    clearance,
    clearance_met,
    minimum_heights: minimum ? { ...minimum, step_m: search.step_m } : null,
    losses_db: { free_space: freeSpaceLossDb(D, radio.frequency_ghz) },
    target_met: clearance_met,
    ...(clearance_reliable ? {} : { clearance_reliable }),
    warnings,
  };
  const { result, height_gain } = linkLosses(study, link, radio, base, profile);
  const figure: LinkFigureData = { profile, lambda_m, ks, height_gain };
  if (study.design.wave_solution !== false && result.diffraction_db_by_method) {
    const wave: LinkWaveJob = { profile, ends: base.ends, frequency_ghz: radio.frequency_ghz, polarization: link.polarization, byMethod: result.diffraction_db_by_method };
    if (options.deferWave) return { result, figure, wave };
    applyLinkWave(result, figure, solveLinkWave(study, wave));
  }
  return { result, figure };
}
