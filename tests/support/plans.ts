/** Floorplans for tests and benchmarks: drawn as text, or seeded random ones. */
import type { Floorplan } from "../../lib/floorplan/types";
import { createRng } from "../../simulators/rng";

/** '#' blocked, '.' free; row 0 first; one-foot tiles, no marks, docks or no-go tiles. */
export function planFromLines(lines: string[]): Floorplan {
  const rows = lines.length;
  const cols = lines[0].length;
  const blocked = new Uint8Array(rows * cols);
  lines.forEach((line, r) => [...line].forEach((ch, c) => (blocked[r * cols + c] = ch === "#" ? 1 : 0)));
  return { rows, cols, tileM: 0.3048, blocked, mark: new Uint8Array(rows * cols), dock: new Uint8Array(rows * cols), nogo: new Uint8Array(rows * cols) };
}

/** A seeded uniform source in [0, 1) (mulberry32), for repeatable random plans. */
export function seededUniform(seed: number): () => number {
  return createRng(seed).uniform;
}

/** Seeded plan with roughly `density` of its tiles blocked. */
export function randomPlan(seed: number, rows: number, cols: number, density: number): Floorplan {
  const random = seededUniform(seed);
  const lines: string[] = [];
  for (let r = 0; r < rows; r++) {
    let line = "";
    for (let c = 0; c < cols; c++) line += random() < density ? "#" : ".";
    lines.push(line);
  }
  return planFromLines(lines);
}
