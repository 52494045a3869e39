/**
 * The classic fit as the core computed it before the one-pass pipeline (see DEVELOPERS.md, "How
 * the solvers work"): sortOrder → poolTies → pavaSorted on power-of-two-scaled pooled values →
 * clip → zero-weight distinct x interpolated. Kept here, built only from the public poolTies and
 * pavaSorted, so that the faster pipeline can be checked against the previous algorithm's output.
 */
import { lerp, share } from '../../src/core/interpolate.js';
import { pavaSorted } from '../../src/core/pava.js';
import { poolTies } from '../../src/core/pool-ties.js';
import type { Direction } from '../../src/core/types.js';

export interface PreviousClassic {
  x: Float64Array;
  value: Float64Array;
  weight: Float64Array;
  fitted: Float64Array;
  levels: number;
  knotX: Float64Array;
  knotY: Float64Array;
}

function exponentOf(v: number): number {
  return v > 0 ? Math.min(1023, Math.max(-1022, Math.ceil(Math.log2(v)))) : 0;
}

/** The previous classic fit of (x, y, w) in `direction`, clipped to [lower, upper]. */
export function previousClassic(
  xs: Float64Array,
  ys: Float64Array,
  ws: Float64Array,
  direction: Direction,
  lower = -Infinity,
  upper = Infinity,
): PreviousClassic {
  let rawY = 0;
  let rawW = 0;
  for (let i = 0; i < ys.length; i++) {
    rawY = Math.max(rawY, Math.abs(ys[i]!));
    rawW = Math.max(rawW, ws[i]!);
  }
  const prescale = rawY > 2 ** 400 || rawW > 2 ** 400;
  const pre = prescale ? 2 ** -exponentOf(rawY) : 1;
  const preW = prescale ? 2 ** -exponentOf(rawW) : 1;
  const pooled = prescale ? poolTies(xs, ys.map((v) => v * pre), ws.map((v) => v * preW)) : poolTies(xs, ys, ws);
  if (prescale) {
    for (let j = 0; j < pooled.y.length; j++) {
      pooled.y[j] = pooled.y[j]! / pre;
      pooled.w[j] = pooled.w[j]! / preW;
    }
  }
  const m = pooled.x.length;
  const active: number[] = [];
  for (let j = 0; j < m; j++) if (pooled.w[j]! > 0) active.push(j);
  let maxY = 0;
  let maxW = 0;
  for (const j of active) {
    maxY = Math.max(maxY, Math.abs(pooled.y[j]!));
    maxW = Math.max(maxW, pooled.w[j]!);
  }
  const yExp = exponentOf(maxY);
  const wScale = 2 ** -(exponentOf(maxW) + 32);
  const sign = direction === 'up' ? 1 : -1;
  const yScale = sign * 2 ** -yExp;
  const ay = Float64Array.from(active, (j) => yScale * pooled.y[j]!);
  const aw = Float64Array.from(active, (j) => wScale * pooled.w[j]!);
  const { fitted: af, starts } = pavaSorted(ay, aw);
  const back = sign * 2 ** yExp;
  const tx = Float64Array.from(active, (j) => pooled.x[j]!);
  const tv = Float64Array.from(af, (v) => Math.min(upper, Math.max(lower, back * v)));
  let levels = starts.length > 0 ? 1 : 0;
  for (let b = 1; b < starts.length; b++) if (tv[starts[b]!] !== tv[starts[b - 1]!]) levels++;
  const value = new Float64Array(m);
  let k = 0;
  for (let j = 0; j < m; j++) {
    while (k < active.length && active[k]! < j) k++;
    if (k < active.length && active[k] === j) value[j] = tv[k]!;
    else if (k === 0) value[j] = tv[0]!;
    else if (k >= active.length) value[j] = tv[active.length - 1]!;
    else value[j] = lerp(tv[k - 1]!, tv[k]!, share(pooled.x[j]!, tx[k - 1]!, tx[k]!));
  }
  const fitted = Float64Array.from(pooled.group, (g) => value[g]!);
  // The knot table: drop points that interpolation of their kept neighbours reproduces exactly.
  const keep: number[] = [0];
  for (let j = 1; j < tx.length - 1; j++) {
    const p = keep[keep.length - 1]!;
    const a = tv[j]! - tv[p]!;
    const b = tv[j + 1]! - tv[j]!;
    const left = a * (tx[j + 1]! - tx[j]!);
    const right = b * (tx[j]! - tx[p]!);
    const flat = a === 0 && b === 0;
    const collinear = a !== 0 && left === right && Math.abs(left) > 1e-290;
    if (!flat && !collinear) keep.push(j);
  }
  if (tx.length > 1) keep.push(tx.length - 1);
  const knotX = Float64Array.from(keep, (j) => tx[j]!);
  const knotY = Float64Array.from(keep, (j) => tv[j]!);
  return { x: pooled.x, value, weight: pooled.w, fitted, levels, knotX, knotY };
}
