/**
 * The overlap map's colour scale: a diverging scale of Paredown's own, from indigo (r = −1)
 * through the page's paper colour (r = 0) to a deep rust (r = +1), interpolated in CIELAB
 * (d3-interpolate's `interpolateLab`). The two arms run along the blue–yellow axis, the one that
 * protanopes and deuteranopes still see, and each arm darkens steadily with |r|, so the strength
 * of a correlation reads from lightness alone (in greyscale too) and its sign from hue.
 */
import { interpolateLab } from 'd3-interpolate';
import { scaleLinear } from 'd3-scale';

/** Anchor colours at r = −1, −0.5, 0, 0.5, 1. */
export const MAP_ANCHORS = ['#2e3a80', '#8d98c9', '#f6f5f0', '#deab55', '#7a3208'] as const;

const scale = scaleLinear<string>().domain([-1, -0.5, 0, 0.5, 1]).range([...MAP_ANCHORS]).interpolate(interpolateLab).clamp(true);

/** Pre-computed RGB for 401 steps of r (−1 to 1 by 0.005), for drawing 90 000 cells quickly. */
const STEPS = 400;
const table = new Uint8ClampedArray((STEPS + 1) * 3);
for (let k = 0; k <= STEPS; k++) {
  const rgb = /rgb\((\d+), (\d+), (\d+)\)/.exec(scale(-1 + (2 * k) / STEPS));
  table[k * 3] = Number(rgb?.[1] ?? 0);
  table[k * 3 + 1] = Number(rgb?.[2] ?? 0);
  table[k * 3 + 2] = Number(rgb?.[3] ?? 0);
}

/**
 * The colour of a correlation as CSS.
 * @param r the correlation (clamped to [−1, 1]).
 * @returns an `rgb(...)` string.
 */
export function colourOf(r: number): string {
  return scale(r);
}

/**
 * Writes the colour of a correlation into an RGBA pixel buffer.
 * @param r the correlation, or null for a pair without one (drawn as a neutral grey).
 * @param pixels the buffer.
 * @param offset index of the pixel's red byte.
 * @param faded blend halfway to the paper colour (pairs below the highlight threshold).
 */
export function writeColour(r: number | null, pixels: Uint8ClampedArray, offset: number, faded: boolean): void {
  if (r === null) {
    pixels[offset] = 200;
    pixels[offset + 1] = 200;
    pixels[offset + 2] = 200;
    pixels[offset + 3] = 255;
    return;
  }
  const k = Math.round(((Math.max(-1, Math.min(1, r)) + 1) / 2) * STEPS) * 3;
  if (faded) {
    // Three quarters of the way to the paper colour (#f6f5f0): still legible, clearly in the back.
    pixels[offset] = (table[k] + 3 * 246) / 4;
    pixels[offset + 1] = (table[k + 1] + 3 * 245) / 4;
    pixels[offset + 2] = (table[k + 2] + 3 * 240) / 4;
  } else {
    pixels[offset] = table[k];
    pixels[offset + 1] = table[k + 1];
    pixels[offset + 2] = table[k + 2];
  }
  pixels[offset + 3] = 255;
}
