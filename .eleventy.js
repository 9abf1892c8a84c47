// Eleventy entry point. Node 20 cannot import .ts statically: register tsx, then load the
// TypeScript setup dynamically.
import "tsx/esm";

const { default: ridgelineSite } = await import("./src/site/eleventy-setup.ts");

export default ridgelineSite;

export const config = {
  dir: { input: "content", includes: "_includes", data: "_data" },
  templateFormats: ["njk"],
  htmlTemplateEngine: "njk",
};
