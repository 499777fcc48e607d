/**
 * Test-only reference: one bin of a discrete Fourier transform taken over a
 * whole number of periods (a coherent DFT), so harmonic k of the period falls
 * exactly on bin k and no window is needed.
 */

/** Amplitude of harmonic `k` of samples spanning exactly one period: |2/N·Σ x[n]·e^(−2πikn/N)|. */
export function harmonicAmplitude(samples: ArrayLike<number>, k: number): number {
  const n = samples.length;
  let re = 0;
  let im = 0;
  for (let i = 0; i < n; i++) {
    // Angle from the integer product, reduced exactly, so no phase drift accumulates.
    const angle = (2 * Math.PI * ((k * i) % n)) / n;
    re += samples[i] * Math.cos(angle);
    im -= samples[i] * Math.sin(angle);
  }
  return (2 / n) * Math.hypot(re, im);
}

/** Harmonic amplitudes 1..maxOrder of one period of samples. */
export function harmonicAmplitudes(samples: ArrayLike<number>, maxOrder: number): Float64Array {
  const out = new Float64Array(maxOrder + 1);
  for (let k = 1; k <= maxOrder; k++) out[k] = harmonicAmplitude(samples, k);
  return out;
}

/** Complex coefficient of harmonic k (same scaling), for phase checks. */
export function harmonicPhasor(samples: ArrayLike<number>, k: number): { re: number; im: number } {
  const n = samples.length;
  let re = 0;
  let im = 0;
  for (let i = 0; i < n; i++) {
    const angle = (2 * Math.PI * ((k * i) % n)) / n;
    re += samples[i] * Math.cos(angle);
    im -= samples[i] * Math.sin(angle);
  }
  return { re: (2 / n) * re, im: (2 / n) * im };
}
