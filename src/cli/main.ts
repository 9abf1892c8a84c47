import { InternalError, RidgelineError } from "../errors.ts";
import { InputError } from "../study/input-error.ts";
import { UsageError } from "./args.ts";

const USAGE = `Usage: ridgeline <command> [options]

Commands:
  build [study-id…]     compute the studies in content/studies and render the site into _site/
  check [study-id…]     compute without rendering; exit 0 when every target is met, 1 when one is missed
  diff <rev> [<rev>]    compare the studies at two git revisions (second: the working tree); ridgeline diff --help
  path                  one link from the command line (ridgeline path --help)
  coverage              one coverage raster from the command line (ridgeline coverage --help)
  pdf <study-id>        print the study and every link to _site/studies/<id>/<id>.pdf (system Chromium)
  new <study-id>        scaffold content/studies/<id>/study.yaml from a commented template
  import <file>…        sites and links from CSV, GeoJSON or KML into a study (ridgeline import --help)
  serve                 build, serve _site on http://127.0.0.1:8080 and rebuild on change (ridgeline serve --help)
  worker --queue URL    run the tasks of builds made with build --queue URL on this machine (ridgeline worker --help)

build, diff and serve keep computed link results in .ridgeline-cache/ (--no-cache to compute everything).
build --queue redis://HOST:PORT spreads the computation over the machines running ridgeline worker.

Exit codes: 0 success, 1 a design target missed (check only), 2 bad input.`;

type Command = (argv: string[]) => Promise<number>;

// Loaded on demand, so that `check` and `path` do not load Eleventy (only build and serve need it).
const COMMANDS: Record<string, () => Promise<Command>> = {
  build: async () => (await import("./commands/build.ts")).buildCommand,
  check: async () => (await import("./commands/check.ts")).checkCommand,
  diff: async () => (await import("./commands/diff.ts")).diffCommand,
  path: async () => (await import("./commands/path.ts")).pathCommand,
  coverage: async () => (await import("./commands/coverage.ts")).coverageCommand,
  pdf: async () => (await import("./commands/pdf.ts")).pdfCommand,
  serve: async () => (await import("./commands/serve.ts")).serveCommand,
  new: async () => (await import("./commands/new.ts")).newCommand,
  import: async () => (await import("./commands/import.ts")).importCommand,
  worker: async () => (await import("./commands/worker.ts")).workerCommand,
};

/** Run the CLI; returns the exit code. Bad input prints a message (no stack) and returns 2. */
export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === "--help" || name === "-h" || name === "help") {
    process.stdout.write(`${USAGE}\n`);
    return name ? 0 : 2;
  }
  const load = Object.hasOwn(COMMANDS, name) ? COMMANDS[name] : undefined;
  if (!load) {
    process.stderr.write(`ridgeline: unknown command "${name}".\n\n${USAGE}\n`);
    return 2;
  }
  try {
    return await (await load())(rest);
  } catch (e) {
    if (e instanceof InputError || e instanceof UsageError || e instanceof RidgelineError) {
      process.stderr.write(`ridgeline ${name}: ${e.message}\n`);
      return 2;
    }
    process.stderr.write(`${internalErrorLine(name, e)}\n`);
    if (process.env.RIDGELINE_DEBUG) process.stderr.write(`${(e as Error)?.stack ?? String(e)}\n`);
    return 70;
  }
}

/**
 * The one line printed for an unexpected failure (exit 70): the command, the study when known,
 * the error's own first line, and how to report it. RIDGELINE_DEBUG=1 adds the stack trace.
 */
export function internalErrorLine(command: string, e: unknown): string {
  const study = e instanceof InternalError ? ` in study ${e.studyId}` : "";
  const what = e instanceof Error ? `${e instanceof InternalError ? "" : `${e.name}: `}${e.message}` : String(e);
  return `ridgeline ${command}: internal error${study}: ${what.split("\n")[0].slice(0, 300)} — a bug; please report it with the study (RIDGELINE_DEBUG=1 prints the stack trace)`;
}
