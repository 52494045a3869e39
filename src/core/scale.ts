/**
 * Power-of-two scales for y and the weights, so that a fit never depends on the units of y or of
 * the weights: the solvers see y with its largest magnitude near 1 and weights near 1, and the
 * answers are scaled back. Scaling by a power of two is exact, so the rescaled problem has the
 * same solution bit for bit.
 */
import { fail } from './errors.js';

/** Result of {@link scaleExponents}. */
export interface ScaleExponents {
  /** y is divided by 2^yExp: the largest |y| of the rows that count lies in (1/2, 1]. */
  readonly yExp: number;
  /**
   * Weights are divided by 2^wExp: the largest becomes (1/2, 1] when the positive weights lie
   * within a ratio of 2^600; for a wider spread the geometric middle goes to 1, so that both the
   * heaviest and the lightest rows stay far from overflow and underflow.
   */
  readonly wExp: number;
  /** log₂ of the ratio of the largest to the smallest positive weight (rounded up to whole numbers). */
  readonly spread: number;
  /** True when the data are far from 1 or the weights widely spread, i.e. rescaling is needed. */
  readonly needed: boolean;
}

/** Beyond this spread (log₂) the weights are centred rather than scaled to their maximum. */
const CENTRE_SPREAD = 600;
/** Spreads beyond 2^1700 (about 1e512; the documented range allows 1e400) cannot be centred safely. */
const MAX_SPREAD = 1700;
/** y or weight exponents beyond ±100 trigger rescaling (products within 2^±300 of 1 are always safe). */
const SAFE_EXPONENT = 100;

/**
 * The power-of-two exponents that bring y and the weights of the rows with positive weight (all
 * rows when `ws` is null) near 1. One O(n) pass, no allocation.
 *
 * @param ys finite responses, length n.
 * @param ws finite weights ≥ 0 with a positive one, length n; null for unit weights.
 * @throws RatchetError NUMERICAL when the positive weights span more than 2^1700 (about 1e512):
 *   no common scale keeps both the heaviest and the lightest row representable in the sums.
 * @example scaleExponents([3e-200, -5e-200], null).yExp // → -662
 * @example scaleExponents([10, 14], [1e100, 1e-300]) // → { yExp: 4, wExp: -331, spread: 1329, needed: true }
 */
export function scaleExponents(ys: ArrayLike<number>, ws: ArrayLike<number> | null): ScaleExponents {
  let maxY = 0;
  let maxW = 0;
  let minW = Infinity;
  for (let i = 0; i < ys.length; i++) {
    const w = ws === null ? 1 : ws[i]!;
    if (w > 0) {
      const a = Math.abs(ys[i]!);
      if (a > maxY) maxY = a;
      if (w > maxW) maxW = w;
      if (w < minW) minW = w;
    }
  }
  return scaleFromExtremes(maxY, maxW, minW);
}

/**
 * {@link scaleExponents} from extremes that a caller has already found in one of its own passes:
 * the largest |y| and the largest and smallest weight among the rows with positive weight. O(1).
 *
 * @param maxY largest |y| of the rows that count, ≥ 0 (Infinity gives exponent 1023, i.e. rescaling).
 * @param maxW largest positive weight; 0 when there is none; 1 for unit weights.
 * @param minW smallest positive weight (ignored when maxW is 0); 1 for unit weights.
 * @throws RatchetError NUMERICAL when maxW / minW exceeds 2^1700, as scaleExponents.
 * @example scaleFromExtremes(14, 1e100, 1e-300) // → { yExp: 4, wExp: -331, spread: 1329, needed: true }
 */
export function scaleFromExtremes(maxY: number, maxW: number, minW: number): ScaleExponents {
  const yExp = exponentOf(maxY);
  const hi = exponentOf(maxW);
  const lo = maxW > 0 ? exponentOf(minW) : hi;
  const spread = hi - lo;
  if (spread > MAX_SPREAD) {
    fail('NUMERICAL', 'weights', 'needs positive weights within a ratio of about 1e500 of each other (the documented range, 1e-300 to 1e100, is within 1e400)');
  }
  const wExp = spread <= CENTRE_SPREAD ? hi : Math.ceil((hi + lo) / 2);
  const needed = Math.abs(yExp) > SAFE_EXPONENT || Math.abs(wExp) > SAFE_EXPONENT || spread > CENTRE_SPREAD;
  return { yExp, wExp, spread, needed };
}

/**
 * v·2^e, applied in two halves so that the factor itself never leaves the range of doubles (2^e
 * alone overflows for e > 1023 and underflows for e < −1074). Exact unless the result itself
 * overflows (±Infinity) or falls below the normal range (then rounded as a subnormal). O(1).
 *
 * @param v any number (±Infinity and NaN pass through).
 * @param e a whole number, typically within ±2100.
 * @example timesPowerOfTwo(3, -1074) // → 1.5e-323
 */
export function timesPowerOfTwo(v: number, e: number): number {
  const half = Math.trunc(e / 2);
  return v * 2 ** half * 2 ** (e - half);
}

/**
 * The exponent k of the smallest power of two 2^k ≥ v (from Math.log2, so exact powers of two may
 * come out one higher — harmless for scaling), clamped to [−1074, 1023]; 0 for v = 0. O(1).
 *
 * @param v a finite number ≥ 0.
 * @example exponentOf(5e-200) // → -662
 */
export function exponentOf(v: number): number {
  return v > 0 ? Math.min(1023, Math.max(-1074, Math.ceil(Math.log2(v)))) : 0;
}
