import { ensureSystemTools } from "./system-tools.ts";

/** Runs once before the test files: installs or demands the system tools the tests use. */
export default function setup(): void {
  ensureSystemTools(["gdallocationinfo", "gdal_translate", "gdal_viewshed", "chromium", "pdfinfo", "redis-server"]);
}
