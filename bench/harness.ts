/**
 * Shared helpers of the benchmark: timing, seeded data, and the result record.
 * Benchmarks print times measured in one run on this machine; they are never timed tests.
 */

/** One line of output: `{case, n, knots, ms}` plus optional extra fields. */
export interface BenchRecord {
  case: string;
  n: number;
  knots: number | string;
  ms: number;
  [extra: string]: unknown;
}

/** Median wall time in milliseconds of `runs` calls of `fn` after three warm-up calls (JIT). */
export function timeMs(fn: () => unknown, runs = 5): number {
  for (let w = 0; w < 3; w++) fn();
  const times: number[] = [];
  for (let r = 0; r < runs; r++) {
    const t0 = performance.now();
    fn();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)]!;
}

/**
 * Median times of `a` and `b` measured alternately (a, b, a, b, …) after `warm` warm-up calls of
 * each, so a change in machine load affects both sides alike (some paths need several rounds before
 * V8 has optimised them).
 */
export function timePair(a: () => unknown, b: () => unknown, runs: number, warm = 1): [number, number] {
  for (let w = 0; w < warm; w++) {
    a();
    b();
  }
  const ta: number[] = [];
  const tb: number[] = [];
  for (let r = 0; r < runs; r++) {
    let t0 = performance.now();
    a();
    ta.push(performance.now() - t0);
    t0 = performance.now();
    b();
    tb.push(performance.now() - t0);
  }
  const median = (v: number[]): number => v.sort((p, q) => p - q)[Math.floor(v.length / 2)]!;
  return [median(ta), median(tb)];
}

/** Deterministic uniform numbers in [0, 1) for benchmark data (a 32-bit LCG; not for statistics). */
export function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

/** Random unsorted x in [0, 100) and a noisy rising y: the standard benchmark data set. */
export function risingData(n: number, seed = 42): { x: Float64Array; y: Float64Array } {
  const r = lcg(seed);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = 100 * r();
    y[i] = Math.log1p(x[i]!) + (r() - 0.5) * 2;
  }
  return { x, y };
}

/** Minimum and median of the CPU times of one case, and of its wall times. */
export interface Spread {
  min: number;
  median: number;
  wallMin: number;
  wallMedian: number;
}

/** A time a case measured itself (a child process): CPU and wall milliseconds. */
export interface OwnTime {
  cpu: number;
  wall: number;
}

/**
 * Times several cases in alternating rounds (a, b, c, a, b, c, …) after `warm` warm-up rounds, so
 * that a change in machine load hits every case alike; returns the minimum and median per case of
 * the process's CPU time (user + system, all threads: on a shared machine far steadier than wall
 * time, which waits for other processes) and of the wall time. A case that returns an
 * {@link OwnTime} reports its own times (a child process that times itself).
 */
export function timeRounds(cases: Record<string, () => unknown>, rounds = 5, warm = 1): Record<string, Spread> {
  const names = Object.keys(cases);
  for (let w = 0; w < warm; w++) for (const k of names) cases[k]!();
  const cpu: Record<string, number[]> = {};
  const wall: Record<string, number[]> = {};
  for (const k of names) {
    cpu[k] = [];
    wall[k] = [];
  }
  for (let r = 0; r < rounds; r++) {
    for (const k of names) {
      const c0 = process.cpuUsage();
      const t0 = performance.now();
      const own = cases[k]!() as OwnTime | undefined;
      const t = performance.now() - t0;
      const c = process.cpuUsage(c0);
      const isOwn = typeof own === 'object' && own !== null && typeof own.cpu === 'number';
      cpu[k]!.push(isOwn ? own.cpu : (c.user + c.system) / 1000);
      wall[k]!.push(isOwn ? own.wall : t);
    }
  }
  const spread = (v: number[]): [number, number] => {
    v.sort((p, q) => p - q);
    return [v[0]!, v[Math.floor(v.length / 2)]!];
  };
  const out: Record<string, Spread> = {};
  for (const k of names) {
    const [min, median] = spread(cpu[k]!);
    const [wallMin, wallMedian] = spread(wall[k]!);
    out[k] = { min, median, wallMin, wallMedian };
  }
  return out;
}

/**
 * Runs `fn` once untimed, then once timed: the same warm-cache measurement a child process makes
 * (a fit just before the timed fit), for the side of a ratio that alternates with such a child.
 */
export function warmTimed(fn: () => unknown): OwnTime {
  fn();
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  fn();
  const wall = performance.now() - t0;
  const c = process.cpuUsage(c0);
  return { cpu: (c.user + c.system) / 1000, wall };
}

/** x rounded to 1000 distinct values in [0, 100) with the same noisy rising y: a data set with many ties. */
export function tiedData(n: number, seed = 42): { x: Float64Array; y: Float64Array } {
  const { x, y } = risingData(n, seed);
  for (let i = 0; i < n; i++) x[i] = Math.floor(x[i]! * 10) / 10;
  return { x, y };
}
