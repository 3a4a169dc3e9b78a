/**
 * `npm run sim -- --robots 4 --floorplan demo`: runs simulated robots from the fleet file
 * against a running Tessera server and takes fault commands on stdin (type `help`).
 */
import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { createInterface } from "node:readline";
import { fileURLToPath } from "node:url";
import { parseArgs } from "node:util";
import { tryParseFloorplan } from "../lib/floorplan";
import { COMMAND_HELP, formatEvent, parseCommand, parseFleetFile } from "./cli-commands";
import { startFleet } from "./fleet-runner";

const ROOT = resolve(fileURLToPath(new URL(".", import.meta.url)), "..");
const DEMO_FLOORPLAN = resolve(ROOT, "db/seed-data/demo-lab.txt");

const USAGE = `Usage: npm run sim -- [options]

Runs simulated Tessera robots that connect to the server exactly as hardware would.

Options:
  --url <url>            server origin (default http://127.0.0.1:3000)
  --fleet <path>         fleet file written by the server's seed (default .data/demo-fleet.json)
  --robots <n>           run the first n robots of the fleet file (default: all)
  --floorplan <demo|path> floor the robots drive on (default demo = db/seed-data/demo-lab.txt)
  --seed <int>           random seed of the fleet (default 1)
  --time-scale <x>       simulated seconds per wall-clock second (default 1)
  -h, --help             this text

Commands on stdin:
${COMMAND_HELP}
`;

function fail(message: string): never {
  console.error(`sim: ${message}`);
  process.exit(2);
}

function readText(path: string, what: string): string {
  try {
    return readFileSync(path, "utf8");
  } catch (err) {
    return fail(`cannot read the ${what} ${path}: ${(err as Error).message}`);
  }
}

let args;
try {
  args = parseArgs({
    options: {
      url: { type: "string", default: "http://127.0.0.1:3000" },
      fleet: { type: "string", default: ".data/demo-fleet.json" },
      robots: { type: "string" },
      floorplan: { type: "string", default: "demo" },
      seed: { type: "string", default: "1" },
      "time-scale": { type: "string", default: "1" },
      help: { type: "boolean", short: "h", default: false },
    },
    strict: true,
  }).values;
} catch (err) {
  fail(`${(err as Error).message}\n\n${USAGE}`);
}
if (args.help) {
  console.log(USAGE);
  process.exit(0);
}

const seed = Number(args.seed);
const timeScale = Number(args["time-scale"]);
if (!Number.isInteger(seed)) fail("--seed must be an integer");
if (!(timeScale > 0) || !Number.isFinite(timeScale)) fail("--time-scale must be a positive number");

const fleetPath = resolve(process.cwd(), args.fleet);
const fleetFile = parseFleetFile(readText(fleetPath, "fleet file"));
if (!fleetFile.ok) fail(`${fleetPath}: ${fleetFile.reason}`);
let specs = fleetFile.robots;
if (args.robots !== undefined) {
  const count = Number(args.robots);
  if (!Number.isInteger(count) || count < 1) fail("--robots must be a positive integer");
  if (count > specs.length) console.error(`sim: the fleet file lists ${specs.length} robots; running all of them`);
  specs = specs.slice(0, count);
}

const planPath = args.floorplan === "demo" ? DEMO_FLOORPLAN : resolve(process.cwd(), args.floorplan);
const planResult = tryParseFloorplan(readText(planPath, "floorplan"));
if (!planResult.ok) fail(`${planPath}: ${planResult.error.reason}`);
const plan = planResult.plan;

const print = (line: string) => console.log(line);

let fleet: Awaited<ReturnType<typeof startFleet>>;
try {
  fleet = await startFleet({
    url: args.url,
    robots: specs,
    plan,
    seed,
    timeScale,
    onEvent: (event) => print(formatEvent(event, Date.now())),
  });
} catch (err) {
  fail((err as Error).message);
}
print(`sim: ${specs.length} robot(s) on ${plan.rows}×${plan.cols} tiles, server ${args.url}, seed ${seed}, time scale ${timeScale}; type help for commands`);

let stopping = false;
async function shutdown(code: number): Promise<void> {
  if (stopping) return;
  stopping = true;
  await fleet.stop();
  process.exit(code);
}
process.on("SIGINT", () => void shutdown(0));
process.on("SIGTERM", () => void shutdown(0));

const input = createInterface({ input: process.stdin, terminal: false });
input.on("line", (line) => {
  const command = parseCommand(line);
  switch (command.kind) {
    case "empty":
      return;
    case "help":
      print(COMMAND_HELP);
      return;
    case "quit":
      void shutdown(0);
      return;
    case "error":
      print(`sim: ${command.reason}`);
      return;
    case "status":
      for (const robot of fleet.robots.values()) {
        const s = robot.snapshot();
        print(
          `${s.id} tile=${s.truth.row},${s.truth.col} heading=${s.truth.heading} battery=${s.battery.toFixed(3)} link=${s.link}` +
            ` action=${s.action ?? "none"} held=${s.held} mission=${s.mission ?? "none"} simS=${s.timeS.toFixed(1)}`,
        );
      }
      return;
    case "fault": {
      const result = fleet.inject(command.robot, command.fault);
      if (!result.ok) print(`sim: ${command.fault.kind} ${command.robot}: ${result.reason}`);
    }
  }
});
// Without a terminal (stdin closed, e.g. started in the background) the fleet keeps running until a signal.
input.on("close", () => {});
