import { RidgelineError } from "../errors.ts";
import { InputError } from "../study/input-error.ts";
import { UsageError } from "./args.ts";
import { buildCommand } from "./commands/build.ts";
import { checkCommand } from "./commands/check.ts";
import { pathCommand } from "./commands/path.ts";
import { pdfCommand } from "./commands/pdf.ts";

const USAGE = `Usage: ridgeline <command> [options]

Commands:
  build [study-id…]     compute the studies in content/studies and render the site into _site/
  check [study-id…]     compute without rendering; exit 0 when every target is met, 1 when one is missed
  path                  one link from the command line (ridgeline path --help)
  pdf <study-id>        print the study and every link to _site/studies/<id>/<id>.pdf (system Chromium)
  serve                 build, then serve _site and rebuild on change

Exit codes: 0 success, 1 a design target missed (check only), 2 bad input.`;

type Command = (argv: string[]) => Promise<number>;

const COMMANDS: Record<string, Command> = {
  build: buildCommand,
  check: checkCommand,
  path: pathCommand,
  pdf: pdfCommand,
};

/** Run the CLI; returns the exit code. Bad input prints a message (no stack) and returns 2. */
export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === "--help" || name === "-h" || name === "help") {
    process.stdout.write(`${USAGE}\n`);
    return name ? 0 : 2;
  }
  const cmd = COMMANDS[name];
  if (!cmd) {
    process.stderr.write(`ridgeline: unknown command "${name}".\n\n${USAGE}\n`);
    return 2;
  }
  try {
    return await cmd(rest);
  } catch (e) {
    if (e instanceof InputError || e instanceof UsageError || e instanceof RidgelineError) {
      process.stderr.write(`ridgeline ${name}: ${e.message}\n`);
      return 2;
    }
    process.stderr.write(`ridgeline ${name}: internal error — please report it with the input that caused it.\n${(e as Error)?.stack ?? String(e)}\n`);
    return 70;
  }
}
