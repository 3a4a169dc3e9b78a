/** PNG images for floorplan import tests, drawn tile by tile with pngjs. */
import { PNG } from "pngjs";

/** A grey PNG of `lines` ('#' dark, '.' light), each tile `ppt` pixels square. */
export function pngOfLines(lines: string[], ppt: number, grey = { dark: 30, light: 225 }): Buffer {
  const rows = lines.length;
  const cols = lines[0].length;
  const png = new PNG({ width: cols * ppt, height: rows * ppt });
  for (let y = 0; y < rows * ppt; y++) {
    for (let x = 0; x < cols * ppt; x++) {
      const g = lines[Math.floor(y / ppt)][Math.floor(x / ppt)] === "#" ? grey.dark : grey.light;
      const i = (y * cols * ppt + x) * 4;
      png.data[i] = g;
      png.data[i + 1] = g;
      png.data[i + 2] = g;
      png.data[i + 3] = 255;
    }
  }
  return PNG.sync.write(png);
}

/** The same PNG with its IHDR claiming width × height: the pixel data no longer matches, which only decoding would find. */
export function pngClaiming(png: Buffer, width: number, height: number): Buffer {
  const out = Buffer.from(png);
  out.writeUInt32BE(width, 16);
  out.writeUInt32BE(height, 20);
  return out;
}
