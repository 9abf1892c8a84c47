import { resolve } from "node:path";
import { defaultWorkerName } from "../../queue/identity.ts";
import { parseRedisUrl } from "../../queue/redis-url.ts";
import { runWorker } from "../../queue/worker.ts";
import { numberArg, parseArgs, UsageError } from "../args.ts";

const HELP = `Usage: ridgeline worker --queue redis://[:PASSWORD@]HOST:PORT[/DB] [--concurrency N] [--terrain-root DIR] [--name NAME] [--stall-seconds S]

Runs the tasks that \`ridgeline build --queue URL\` puts on the queue (links and coverage maps)
until stopped; SIGTERM or Ctrl-C finishes the tasks in hand, then exits.
  --concurrency N     tasks at once (default 1; a coverage task uses every core already)
  --terrain-root DIR  the folder standing for the coordinator's project folder, where the
                      studies' terrain files are found (default: the same paths as there)
  --name NAME         name in progress lines and failure messages (default HOST:PID)
  --stall-seconds S   a task whose worker stops answering this long is run elsewhere (default 30)
Exit codes: 0 stopped, 2 bad options, Redis unreachable, or the coordinator runs another version.`;

/** `ridgeline worker --queue URL [--concurrency N] [--terrain-root DIR] [--name NAME] [--stall-seconds S]` */
export async function workerCommand(argv: string[]): Promise<number> {
  if (argv.includes("--help") || argv.includes("-h")) {
    process.stdout.write(`${HELP}\n`);
    return 0;
  }
  const args = parseArgs(argv, { values: ["queue", "concurrency", "terrain-root", "name", "stall-seconds"] });
  if (args.positional.length) throw new UsageError(`worker takes no positional arguments (received "${args.positional[0]}").\n${HELP}`);
  const url = args.values.get("queue")?.[0];
  if (!url) throw new UsageError(`worker needs --queue redis://HOST:PORT (the URL the coordinator builds with).\n${HELP}`);
  const target = parseRedisUrl(url);
  const conc = args.values.get("concurrency")?.[0];
  const stall = args.values.get("stall-seconds")?.[0];
  const root = args.values.get("terrain-root")?.[0];
  return runWorker(target, {
    concurrency: conc === undefined ? 1 : numberArg("concurrency", conc, (x) => Number.isInteger(x) && x >= 1 && x <= 64, "a whole number from 1 to 64"),
    stallSeconds: stall === undefined ? 30 : numberArg("stall-seconds", stall, (x) => x >= 1 && x <= 3600, "seconds from 1 to 3600"),
    terrainRoot: root ? resolve(root) : null,
    name: args.values.get("name")?.[0] ?? defaultWorkerName(),
    log: (line) => process.stderr.write(`${line}\n`),
  });
}
