/**
 * Planner benchmark: planPolicy against the deterministic Dijkstra (costToGoal, shortestTurns) on
 * seeded 128×128 and 256×256 floorplans with scattered obstacles. Prints median and best times over
 * several runs, sweeps, the planPolicy/costToGoal ratio (target < 10× on 256×256) and the memory of
 * one 256×256 policy. buildTransitions is timed separately: the table depends only on plan and model,
 * so the fleet service builds it once per floorplan version and reuses it for every goal.
 */
import { buildTransitions, defaultMotion, type MotionModel } from "../../lib/motion";
import { costToGoal, planPolicy, shortestTurns } from "../../lib/planning";
import type { Floorplan } from "../../lib/floorplan/types";
import { seededUniform } from "../support/plans";

const RUNS = 7;

function seededPlan(side: number, density: number, seed: number): { plan: Floorplan; goal: { row: number; col: number } } {
  const random = seededUniform(seed);
  const n = side * side;
  const blocked = new Uint8Array(n);
  for (let i = 0; i < n; i++) blocked[i] = random() < density ? 1 : 0;
  // A few wall segments with doorways, so routes bend around more than single obstacles.
  for (let k = 1; k < 4; k++) {
    const row = Math.floor((k * side) / 4);
    for (let col = 0; col < side; col++) if (col % 37 > 3) blocked[row * side + col] = 1;
  }
  const goal = { row: Math.floor(side / 2) + 1, col: Math.floor(side / 3) };
  blocked[goal.row * side + goal.col] = 0;
  return { plan: { rows: side, cols: side, tileM: 0.3048, blocked, mark: new Uint8Array(n), dock: new Uint8Array(n), nogo: new Uint8Array(n) }, goal };
}

function timed<T>(run: () => T): { ms: number[]; last: T } {
  const ms: number[] = [];
  let last!: T;
  for (let i = 0; i < RUNS; i++) {
    const t = performance.now();
    last = run();
    ms.push(performance.now() - t);
  }
  return { ms, last };
}

const median = (ms: number[]) => ms.slice().sort((x, y) => x - y)[Math.floor(ms.length / 2)];
const best = (ms: number[]) => Math.min(...ms);
const fmt = (ms: number[]) => `${median(ms).toFixed(1)} ms (best ${best(ms).toFixed(1)})`;

function benchOne(side: number, model: MotionModel): void {
  const { plan, goal } = seededPlan(side, 0.18, 20_251_201 + side);
  const tableRun = timed(() => buildTransitions(plan, model));
  const table = tableRun.last;
  const dijkstra = timed(() => costToGoal(plan, goal, model.cost));
  const route = timed(() => shortestTurns(plan, { row: 1, col: 1, heading: "E" }, goal, model.cost));
  let sweeps = 0;
  const policyRun = timed(() => planPolicy(plan, goal, model, { table, onSweep: (n) => (sweeps = n) }));
  const withTable = timed(() => planPolicy(plan, goal, model));
  const policy = policyRun.last;
  let reachable = 0;
  for (let s = 0; s < policy.value.length; s++) if (policy.value[s] >= 0) reachable++;
  const ratio = median(policyRun.ms) / median(dijkstra.ms);
  console.log(`planner ${side}×${side} ${model.drive}: ${reachable} reachable states of ${policy.value.length}`);
  console.log(`  buildTransitions      ${fmt(tableRun.ms)}`);
  console.log(`  costToGoal (Dijkstra) ${fmt(dijkstra.ms)}`);
  console.log(`  shortestTurns (1,1)→goal ${fmt(route.ms)}, cost ${route.last?.cost.toFixed(1) ?? "none"}`);
  console.log(`  planPolicy (table given) ${fmt(policyRun.ms)}, ${sweeps} sweeps, converged ${policy.converged}`);
  console.log(`  planPolicy (builds table) ${fmt(withTable.ms)}`);
  console.log(`  ratio planPolicy / costToGoal: ${ratio.toFixed(1)}× median, ${(best(policyRun.ms) / best(dijkstra.ms)).toFixed(1)}× best${side === 256 ? `  (target < 10×: ${ratio < 10 ? "met" : "NOT met"})` : ""}`);
  if (side === 256) {
    const mb = (policy.value.byteLength + policy.action.byteLength) / (1024 * 1024);
    console.log(`  policy memory (value Float64 + action Uint8): ${mb.toFixed(2)} MB`);
  }
}

/** Runs the planner benchmark and prints its figures. */
export async function runPlannerBench(): Promise<void> {
  for (const side of [128, 256]) benchOne(side, defaultMotion("differential"));
  benchOne(256, defaultMotion("bicycle"));
}
