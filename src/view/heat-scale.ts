/**
 * The heat-map of a fitted surface, without the DOM: the sequential colour scale and the
 * conversion of a RATCHET.GRID table into rows of labelled, coloured cells. Shared by the task
 * pane (an HTML table) and `npm run demo` (an SVG picture).
 *
 * The scale is our own: a path through OKLab (Ottosson 2020, "A perceptual color space for image
 * processing", bottosson.github.io/posts/oklab — matrices from that post, (memory)) whose
 * lightness falls evenly from pale yellow (low values) over green and teal to deep blue (high
 * values). Equal steps of the value give about equal steps of perceived lightness, so the order
 * of the cells reads correctly in colour, in grey and for the common colour-vision deficiencies
 * (a lightness ramp does not depend on hue; common practice of sequential scales). Each cell
 * carries its own text colour (black or white, whichever contrasts more with the background), so
 * the numbers stay legible in light and dark themes.
 */
import type { CellResult } from '../functions/types.js';
import { DEFAULT_DIGITS, formatNumber } from './number-format.js';

/** An sRGB colour, each channel 0 … 255. */
export interface Rgb {
  readonly r: number;
  readonly g: number;
  readonly b: number;
}

/** Anchors of the scale in OKLCH: lightness, chroma, hue (degrees), at t = 0, 0.5, 1. */
const L0 = 0.96;
const L1 = 0.32;
const HUE0 = 100;
const HUE1 = 268;
const CHROMA_PEAK = 0.13;

function toSrgbChannel(c: number): number {
  const v = c <= 0.0031308 ? 12.92 * c : 1.055 * Math.pow(c, 1 / 2.4) - 0.055;
  return v;
}

/** OKLab → linear sRGB (Ottosson's matrices, (memory)). */
function oklabToLinear(L: number, a: number, b: number): [number, number, number] {
  const l = (L + 0.3963377774 * a + 0.2158037573 * b) ** 3;
  const m = (L - 0.1055613458 * a - 0.0638541728 * b) ** 3;
  const s = (L - 0.0894841775 * a - 1.291485548 * b) ** 3;
  return [
    4.0767416621 * l - 3.3077115913 * m + 0.2309699292 * s,
    -1.2684380046 * l + 2.6097574011 * m - 0.3413193965 * s,
    -0.0041960863 * l - 0.7034186147 * m + 1.707614701 * s,
  ];
}

/**
 * OKLCH → sRGB 0 … 255; a colour outside the sRGB gamut keeps its lightness and hue and loses
 * chroma (bisection, 24 steps) until it fits. Cost O(1).
 */
export function oklchToRgb(L: number, C: number, hueDeg: number): Rgb {
  const h = (hueDeg * Math.PI) / 180;
  const inGamut = (c: number): [number, number, number] | undefined => {
    const lin = oklabToLinear(L, c * Math.cos(h), c * Math.sin(h));
    return lin.every((v) => v >= -1e-9 && v <= 1 + 1e-9) ? lin : undefined;
  };
  let lin = inGamut(C);
  if (!lin) {
    let lo = 0;
    let hi = C;
    for (let i = 0; i < 24; i++) {
      const mid = (lo + hi) / 2;
      if (inGamut(mid)) lo = mid;
      else hi = mid;
    }
    lin = inGamut(lo) ?? oklabToLinear(L, 0, 0);
  }
  const [r, g, b] = lin.map((v) => Math.round(255 * toSrgbChannel(Math.min(1, Math.max(0, v))))) as [number, number, number];
  return { r, g, b };
}

/**
 * The scale's colour at t ∈ [0, 1] (0 = lowest value, pale; 1 = highest, dark); t outside is
 * clamped, NaN gives t = 0. Lightness is linear in t from 0.96 to 0.32; chroma rises to 0.13 in
 * the middle and falls towards both ends; hue turns from 100° to 268°. Cost O(1).
 * @example heatColour(0) // → { r: 249, g: 243, b: 205 } (pale yellow); heatColour(1) // → { r: 40, g: 50, b: 77 } (deep blue)
 */
export function heatColour(t: number): Rgb {
  const u = t > 0 ? (t < 1 ? t : 1) : 0;
  const L = L0 + (L1 - L0) * u;
  const C = 0.05 + (CHROMA_PEAK - 0.05) * Math.sin(Math.PI * Math.min(1, u * 1.15));
  const hue = HUE0 + (HUE1 - HUE0) * u;
  return oklchToRgb(L, C, hue);
}

/** WCAG 2.x relative luminance of an sRGB colour (W3C WCAG 2.1, "relative luminance"). */
export function luminance(c: Rgb): number {
  const lin = (v: number): number => {
    const s = v / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(c.r) + 0.7152 * lin(c.g) + 0.0722 * lin(c.b);
}

/** WCAG 2.x contrast ratio of two colours, 1 … 21. */
export function contrast(a: Rgb, b: Rgb): number {
  const [x, y] = [luminance(a), luminance(b)].sort((p, q) => q - p) as [number, number];
  return (x + 0.05) / (y + 0.05);
}

const BLACK: Rgb = { r: 0, g: 0, b: 0 };
const WHITE: Rgb = { r: 255, g: 255, b: 255 };

/** Black or white, whichever contrasts more with `background` (always ≥ 4.5 : 1 against any colour). */
export function textColourOn(background: Rgb): Rgb {
  return contrast(background, BLACK) >= contrast(background, WHITE) ? BLACK : WHITE;
}

/** `#rrggbb`. */
export function hex(c: Rgb): string {
  return `#${[c.r, c.g, c.b].map((v) => v.toString(16).padStart(2, '0')).join('')}`;
}

/** One coloured cell of the heat-map. */
export interface HeatCell {
  readonly value: number;
  /** The number as shown (8 significant digits at most). */
  readonly text: string;
  /** Position on the scale, 0 … 1. */
  readonly t: number;
  readonly background: string;
  readonly color: string;
}

/** A fitted lattice ready to draw: rows follow the x2 knots (as RATCHET.GRID lays them out). */
export interface HeatmapView {
  /** x1 knot positions (the table's columns). */
  readonly knots1: number[];
  /** x2 knot positions (the table's rows). */
  readonly knots2: number[];
  /** values[b][a] is the surface at (knots1[a], knots2[b]). */
  readonly values: number[][];
  readonly cells: HeatCell[][];
  readonly min: number;
  readonly max: number;
}

/**
 * A heat-map value as the pane shows it: `digits` significant digits (see formatNumber).
 * @param digits 1 … 17; default 4.
 * @example cellText(28.679391) // → "28.68"
 */
export function cellText(v: number, digits: number = DEFAULT_DIGITS): string {
  return formatNumber(v, digits);
}

/**
 * Reads a RATCHET.GRID result (first row: "" then the x1 knots; each next row: an x2 knot then
 * the values) into a heat-map view; colours run from the smallest to the largest value (all cells
 * get t = 0 when the surface is flat). Cost O(K1·K2).
 * @throws Error when the table is not shaped like a GRID result (fewer than 2 rows or 2 columns,
 *   a non-number where a knot or value belongs, ragged rows).
 * @param digits significant digits of the cells' text, 1 … 17; default 4 (values keep full precision).
 * @example heatmapFromGrid([['', 1, 2], [10, 0.5, 3]]).cells[0].map((c) => c.text) // → ['0.5', '3']
 */
export function heatmapFromGrid(table: CellResult | readonly (readonly unknown[])[], digits: number = DEFAULT_DIGITS): HeatmapView {
  const g = (Array.isArray(table) ? table : [[table]]) as readonly (readonly unknown[])[];
  if (g.length < 2 || (g[0]?.length ?? 0) < 2) throw new Error('not a GRID table: needs a header row and at least one row of values');
  const width = g[0]!.length;
  const num = (v: unknown, where: string): number => {
    if (typeof v !== 'number' || !Number.isFinite(v)) throw new Error(`not a GRID table: ${where} is ${JSON.stringify(v)}`);
    return v;
  };
  const knots1 = g[0]!.slice(1).map((v, a) => num(v, `x1 knot ${a + 1}`));
  const knots2: number[] = [];
  const values: number[][] = [];
  for (let b = 1; b < g.length; b++) {
    const row = g[b]!;
    if (row.length !== width) throw new Error(`not a GRID table: row ${b + 1} has ${row.length} cells, the header ${width}`);
    knots2.push(num(row[0], `x2 knot ${b}`));
    values.push(row.slice(1).map((v, a) => num(v, `value ${b},${a + 1}`)));
  }
  let min = Infinity;
  let max = -Infinity;
  for (const row of values) for (const v of row) [min, max] = [Math.min(min, v), Math.max(max, v)];
  const span = max - min;
  const cells = values.map((row) =>
    row.map((value) => {
      const t = span > 0 ? (value - min) / span : 0;
      const bg = heatColour(t);
      return { value, text: cellText(value, digits), t, background: hex(bg), color: hex(textColourOn(bg)) };
    }),
  );
  return { knots1, knots2, values, cells, min, max };
}
