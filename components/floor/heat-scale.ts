/**
 * The belief heat colours. Tile mass is mapped on a log axis so that a spread-out belief
 * (say 1/2000 per tile) is still a faint wash while a sharp peak reads as bright;
 * a linear axis would hide every belief that is not already certain.
 */
import { scaleLinear, scaleLog } from "@visx/scale";

/** Smallest mass drawn; below it a tile is left clear (about a quarter of 1/4096). */
export const HEAT_MIN_MASS = 1e-4;

/** Tessera's heat ramp, from a deep sea-glass to a pale foam, as stops on [0, 1]. */
export const HEAT_STOPS = ["#0b3b4a", "#127a78", "#2dd4bf", "#b8f5e6", "#fff7d6"] as const;

/** The mass axis; built once because a repaint reads it for every tile. It is never mutated. */
const MASS_AXIS = scaleLog<number>({ domain: [HEAT_MIN_MASS, 1], range: [0, 1], clamp: true });

/** Position on the heat ramp in [0, 1] for a tile mass (clamped; NaN and ≤ HEAT_MIN_MASS give 0). */
export function heatPosition(mass: number): number {
  if (!(mass > HEAT_MIN_MASS)) return 0;
  return MASS_AXIS(mass);
}

/** The visx colour scale over ramp positions [0, 1]; returns "rgb(r, g, b)" strings. */
export function heatColourScale() {
  const n = HEAT_STOPS.length - 1;
  return scaleLinear<string>({ domain: HEAT_STOPS.map((_, i) => i / n), range: [...HEAT_STOPS], clamp: true });
}

/** Opacity of a heat tile for a ramp position: faint tails, solid peaks, in [0, 0.9]. */
export function heatOpacity(position: number): number {
  if (!(position > 0)) return 0;
  return Math.min(0.9, 0.18 + 0.72 * position);
}

/**
 * RGBA bytes for ramp positions 0/255 … 255/255 (entry i at 4i … 4i+3), so a canvas
 * repaint looks colours up instead of interpolating per tile. Entry 0 is transparent.
 */
export function heatRgbaTable(): Uint8ClampedArray {
  const colour = heatColourScale();
  const table = new Uint8ClampedArray(256 * 4);
  for (let i = 1; i < 256; i++) {
    const p = i / 255;
    const rgb = (colour(p).match(/\d+(\.\d+)?/g) ?? ["0", "0", "0"]).map(Number);
    table.set([rgb[0], rgb[1], rgb[2], Math.round(heatOpacity(p) * 255)], i * 4);
  }
  return table;
}

/** Index into heatFillTable for a mass, in 0..255 (0 = not drawn). */
export function heatIndex(mass: number): number {
  const p = heatPosition(mass);
  return p <= 0 ? 0 : Math.max(1, Math.round(p * 255));
}
