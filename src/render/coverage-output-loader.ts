import type { CoverageOutputStage } from "../coverage/coverage-output-stage.ts";

/**
 * The coverage output stage, loaded when a study has coverage: it brings the raster encoders
 * (sharp), which link analysis, `ridgeline path` and `check` of a links-only study do not need.
 */
export const loadCoverageOutputStage = (): Promise<CoverageOutputStage> => import("./coverage-outputs.ts").then((m) => m.coverageOutputStage);
