/**
 * Spread of a metric over many runs: extremes, mean, standard deviation and
 * percentiles. Percentiles interpolate linearly between order statistics,
 * R. J. Hyndman & Y. Fan, "Sample quantiles in statistical packages",
 * The American Statistician 50(4), 1996, definition 7: for sorted x_1..x_n,
 * h = (n − 1)·p, Q(p) = x_⌊h⌋+1 + (h − ⌊h⌋)(x_⌊h⌋+2 − x_⌊h⌋+1).
 */
import { InputError } from '../errors.ts';

export interface Spread {
  count: number;
  min: number;
  p5: number;
  p25: number;
  median: number;
  p75: number;
  p95: number;
  max: number;
  mean: number;
  /** Sample standard deviation (n − 1); 0 for a single value. */
  standardDeviation: number;
}

/** Quantile p (0…1) of ascending values, Hyndman–Fan definition 7. */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  if (sorted.length === 0) throw new InputError('values', 'at least one value', 'got none');
  if (!(p >= 0 && p <= 1)) throw new InputError('p', 'a probability from 0 to 1', `got ${p}`);
  const h = (sorted.length - 1) * p;
  const low = Math.floor(h);
  const high = Math.min(sorted.length - 1, low + 1);
  return sorted[low] + (h - low) * (sorted[high] - sorted[low]);
}

/** Spread of the finite values among `values` (nulls are runs where the metric was not measured); null if none. */
export function spreadOf(values: ReadonlyArray<number | null>): Spread | null {
  const finite = values.filter((v): v is number => v !== null && Number.isFinite(v));
  if (finite.length === 0) return null;
  const sorted = Float64Array.from(finite).sort();
  // Welford's running mean and variance: stable for values far from zero.
  let mean = 0;
  let m2 = 0;
  for (let i = 0; i < sorted.length; i++) {
    const delta = sorted[i] - mean;
    mean += delta / (i + 1);
    m2 += delta * (sorted[i] - mean);
  }
  return {
    count: sorted.length,
    min: sorted[0],
    p5: quantileSorted(sorted, 0.05),
    p25: quantileSorted(sorted, 0.25),
    median: quantileSorted(sorted, 0.5),
    p75: quantileSorted(sorted, 0.75),
    p95: quantileSorted(sorted, 0.95),
    max: sorted[sorted.length - 1],
    mean,
    standardDeviation: sorted.length > 1 ? Math.sqrt(m2 / (sorted.length - 1)) : 0,
  };
}
