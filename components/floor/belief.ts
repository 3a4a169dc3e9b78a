/**
 * Belief frames as the live floor holds them: decoding the bytes socket.io delivers,
 * reading the mass on one tile, and blending every robot's marginal into one layer.
 * Assumes the quantisation of lib/protocol (255 = the frame's largest tile mass).
 */
import type { BeliefFrame } from "@/lib/protocol/ops-feed";

/** A decoded belief frame; `data` holds rows*cols bytes, row-major. */
export interface BeliefView {
  robotId: string;
  rows: number;
  cols: number;
  /** Tile mass of the byte 255, in [0, 1]. */
  scale: number;
  data: Uint8Array;
}

/**
 * Turns a received belief frame into a BeliefView, or null when its shape does not match
 * the floorplan (rows × cols) or its bytes do not cover every tile.
 */
export function beliefFromWire(frame: Omit<BeliefFrame, "data"> & { data: unknown }, rows: number, cols: number): BeliefView | null {
  if (frame.rows !== rows || frame.cols !== cols) return null;
  if (!Number.isFinite(frame.scale) || frame.scale < 0 || frame.scale > 1) return null;
  const data = bytesFromWire(frame.data);
  if (!data || data.length !== rows * cols) return null;
  return { robotId: frame.robotId, rows, cols, scale: frame.scale, data };
}

/** Bytes from what socket.io hands over: an ArrayBuffer, a typed view (Node Buffer) or a plain array of 0..255. */
export function bytesFromWire(raw: unknown): Uint8Array | null {
  if (raw instanceof ArrayBuffer) return new Uint8Array(raw);
  if (ArrayBuffer.isView(raw)) return new Uint8Array(raw.buffer, raw.byteOffset, raw.byteLength);
  if (Array.isArray(raw) && raw.every((v) => Number.isInteger(v) && v >= 0 && v <= 255)) return Uint8Array.from(raw as number[]);
  return null;
}

/** Belief mass on tile (row, col) in [0, 1]; 0 outside the plan. */
export function beliefMassAt(view: BeliefView, row: number, col: number): number {
  if (row < 0 || row >= view.rows || col < 0 || col >= view.cols) return 0;
  return (view.data[row * view.cols + col] / 255) * view.scale;
}

/**
 * Per-tile mass summed over the given beliefs, written into `out` (length rows*cols).
 * Each robot's marginal sums to 1, so a tile's blended value is the expected number of
 * robots on it, in [0, beliefs.length]. Returns the largest blended value.
 */
export function blendBeliefs(beliefs: readonly BeliefView[], out: Float32Array): number {
  out.fill(0);
  for (const view of beliefs) {
    if (view.data.length !== out.length) continue;
    const k = view.scale / 255;
    const data = view.data;
    for (let i = 0; i < data.length; i++) if (data[i] !== 0) out[i] += data[i] * k;
  }
  let max = 0;
  for (let i = 0; i < out.length; i++) if (out[i] > max) max = out[i];
  return max;
}

/** One robot's masses written into `out` (length rows*cols); returns the largest. */
export function beliefMasses(view: BeliefView, out: Float32Array): number {
  const k = view.scale / 255;
  let max = 0;
  for (let i = 0; i < out.length; i++) {
    const m = i < view.data.length ? view.data[i] * k : 0;
    out[i] = m;
    if (m > max) max = m;
  }
  return max;
}
