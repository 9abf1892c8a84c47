import cliProgress from "cli-progress";

/**
 * A progress reporter for long computations: a bar on an interactive terminal when there
 * is enough work to watch, nothing otherwise (CI logs stay clean).
 */
export function progressReporter(label: string, minWork = 20): { update(done: number, total: number): void; stop(): void } {
  let bar: cliProgress.SingleBar | null = null;
  const tty = Boolean(process.stderr.isTTY);
  return {
    update(done, total) {
      if (!tty || total < minWork) return;
      if (!bar) {
        bar = new cliProgress.SingleBar({ format: `${label} [{bar}] {value}/{total}`, stream: process.stderr, hideCursor: true }, cliProgress.Presets.shades_classic);
        bar.start(total, 0);
      }
      bar.setTotal(total);
      bar.update(done);
    },
    stop() {
      bar?.stop();
      bar = null;
    },
  };
}
