/**
 * Test-only reference: Fourier-series quantities of a 2π-periodic function by
 * composite Simpson integration over pieces on which the function is smooth
 * (break points at its kinks), so the error is O(h⁴) rather than O(h²).
 */

/** ∫ f over [a, b] by composite Simpson with `intervals` (even) sub-intervals. */
export function simpson(f: (theta: number) => number, a: number, b: number, intervals = 4000): number {
  const h = (b - a) / intervals;
  let sum = f(a) + f(b);
  for (let i = 1; i < intervals; i++) sum += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (sum * h) / 3;
}

/** ∫_0^{2π} f, split at the sorted break points inside (0, 2π). */
export function integratePeriod(f: (theta: number) => number, breaks: number[]): number {
  const edges = [0, ...breaks.filter((b) => b > 0 && b < 2 * Math.PI).sort((x, y) => x - y), 2 * Math.PI];
  let total = 0;
  for (let i = 0; i + 1 < edges.length; i++) total += simpson(f, edges[i], edges[i + 1]);
  return total;
}

export interface SeriesFacts {
  readonly mean: number;
  /** Amplitude √(a_n² + b_n²) of harmonic n (index n), for n = 1..maxOrder. */
  readonly amplitudes: Float64Array;
  /** Mean square of f minus its mean (the ac power: Parseval's Σ amplitude²/2). */
  readonly acMeanSquare: number;
  /** THD_F from the full ac power: √(acMs − A1²/2) / (A1/√2), no truncation. */
  readonly thdFundamental: number;
}

export function fourierFacts(f: (theta: number) => number, breaks: number[], maxOrder: number): SeriesFacts {
  const mean = integratePeriod(f, breaks) / (2 * Math.PI);
  const meanSquare = integratePeriod((t) => f(t) * f(t), breaks) / (2 * Math.PI);
  const amplitudes = new Float64Array(maxOrder + 1);
  for (let n = 1; n <= maxOrder; n++) {
    const a = integratePeriod((t) => f(t) * Math.cos(n * t), breaks) / Math.PI;
    const b = integratePeriod((t) => f(t) * Math.sin(n * t), breaks) / Math.PI;
    amplitudes[n] = Math.hypot(a, b);
  }
  const acMeanSquare = meanSquare - mean * mean;
  const a1 = amplitudes[1];
  return { mean, amplitudes, acMeanSquare, thdFundamental: Math.sqrt(acMeanSquare - (a1 * a1) / 2) / (a1 / Math.SQRT2) };
}
