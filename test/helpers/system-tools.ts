import { execFileSync, spawnSync } from "node:child_process";

/** True when `name` is on PATH (GDAL 3.6 tools exit 1 on --help, so use command -v). */
export function hasCommand(name: string): boolean {
  return spawnSync("sh", ["-c", `command -v ${name}`], { stdio: "ignore" }).status === 0;
}

const PACKAGES: Record<string, string> = {
  chromium: "chromium",
  gdallocationinfo: "gdal-bin",
  gdal_viewshed: "gdal-bin",
  gdal_translate: "gdal-bin",
  gdalinfo: "gdal-bin",
  pdfinfo: "poppler-utils",
  "redis-server": "redis-server",
};

/**
 * Make sure the system tools the tests need are installed. Installs them with apt-get
 * when running as root; otherwise throws naming exactly what to install. Never skips.
 */
export function ensureSystemTools(commands: string[]): void {
  const missing = commands.filter((c) => !hasCommand(c));
  if (missing.length === 0) return;
  const pkgs = [...new Set(missing.map((c) => PACKAGES[c] ?? c))];
  const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
  if (isRoot) {
    try {
      execFileSync("apt-get", ["update", "-qq"], { stdio: "inherit" });
      execFileSync("apt-get", ["install", "-y", "-qq", ...pkgs], {
        stdio: "inherit",
        env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" },
      });
    } catch (e) {
      throw new Error(`Could not install ${pkgs.join(" ")} with apt-get: ${(e as Error).message}`);
    }
  }
  const still = commands.filter((c) => !hasCommand(c));
  if (still.length > 0) {
    throw new Error(
      `The tests need ${still.join(", ")}. Install them with: sudo apt-get install -y ${[
        ...new Set(still.map((c) => PACKAGES[c] ?? c)),
      ].join(" ")}`,
    );
  }
}
