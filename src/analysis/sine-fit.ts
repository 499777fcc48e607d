/**
 * Least-squares sine fit x_n ≈ a·cos(ωt_n) + b·sin(ωt_n) + c, with the
 * frequency refined by Gauss–Newton: the four-parameter fit of IEEE Std
 * 1057 (waveform recorders) and IEEE Std 1241 (ADC testing). Time is
 * centred (t_n = n − (L−1)/2) so the ω column is orthogonal-ish to the rest
 * and the normal equations stay well conditioned.
 *
 * The squares are weighted by a Blackman–Harris window: over a record that
 * is not a whole number of cycles, an unweighted fit is pulled by strong
 * harmonics (their cross terms with the fundamental fall off only as 1/cycles);
 * the window's −92 dB sidelobes make those cross terms negligible.
 */
import { InputError } from '../errors.ts';
import { windowCoefficients } from './windows.ts';

export interface SineFit {
  readonly hertz: number;
  /** Peak amplitude √(a² + b²). */
  readonly amplitude: number;
  readonly cosine: number;
  readonly sine: number;
  readonly offset: number;
}

/**
 * Fit a sine near `initialHertz`. With `refineFrequency` false, the frequency
 * is kept (three-parameter fit); otherwise up to `iterations` Gauss–Newton steps.
 */
export function fitSine(
  samples: ArrayLike<number>,
  rateHertz: number,
  initialHertz: number,
  refineFrequency = true,
  iterations = 8,
): SineFit {
  const length = samples.length;
  const centre = (length - 1) / 2;
  let omega = (2 * Math.PI * initialHertz) / rateHertz; // radians per sample
  let a = 0;
  let b = 0;
  let c = 0;
  const matrix = new Float64Array(16);
  const rhs = new Float64Array(4);
  const row = new Float64Array(4);
  const weights = windowCoefficients('blackman-harris', length);
  for (let iteration = 0; iteration < (refineFrequency ? iterations : 1); iteration++) {
    // The first pass is linear (a, b, c only) so that the ω column has a and b to work with.
    const columns = refineFrequency && iteration > 0 ? 4 : 3;
    matrix.fill(0);
    rhs.fill(0);
    for (let n = 0; n < length; n++) {
      const t = n - centre;
      const cosine = Math.cos(omega * t);
      const sine = Math.sin(omega * t);
      row[0] = cosine;
      row[1] = sine;
      row[2] = 1;
      // d/dω of a·cos(ωt) + b·sin(ωt); the solved step is then Δω.
      row[3] = t * (b * cosine - a * sine);
      // Gauss–Newton on the residual: target is the sample minus the model's ω-part linearised at the current ω.
      const target = samples[n];
      const weight = weights[n];
      for (let i = 0; i < columns; i++) {
        rhs[i] += weight * row[i] * target;
        for (let j = 0; j <= i; j++) matrix[i * 4 + j] += weight * row[i] * row[j];
      }
    }
    for (let i = 0; i < columns; i++) for (let j = 0; j < i; j++) matrix[j * 4 + i] = matrix[i * 4 + j];
    // The linearised model x ≈ a'cos + b'sin + c' + Δω·t(b cos − a sin) is linear in (a', b', c', Δω).
    const solution = solveSymmetric(matrix, rhs, columns);
    a = solution[0];
    b = solution[1];
    c = solution[2];
    if (columns === 3) continue;
    const step = solution[3];
    omega += step;
    if (Math.abs(step) < 1e-13 * Math.max(1, Math.abs(omega))) break;
  }
  if (refineFrequency) {
    // Gauss–Newton only converges from within about a bin; if it wandered further, keep the start.
    const binRadians = (2 * Math.PI) / length;
    const startOmega = (2 * Math.PI * initialHertz) / rateHertz;
    const finalOmega = Number.isFinite(omega) && Math.abs(omega - startOmega) < 2 * binRadians ? omega : startOmega;
    return fitSine(samples, rateHertz, (finalOmega * rateHertz) / (2 * Math.PI), false);
  }
  const hertz = (omega * rateHertz) / (2 * Math.PI);
  if (!Number.isFinite(a) || !Number.isFinite(b) || !Number.isFinite(c)) {
    throw new InputError('samples', `a tone near ${initialHertz} Hz that a sine fit can follow`, 'the fit diverged');
  }
  return { hertz, amplitude: Math.hypot(a, b), cosine: a, sine: b, offset: c };
}

/** Value of the fitted sine at sample index n of the record it was fitted to. */
export function sineFitValue(fit: SineFit, rateHertz: number, length: number, n: number): number {
  const omega = (2 * Math.PI * fit.hertz) / rateHertz;
  const t = n - (length - 1) / 2;
  return fit.cosine * Math.cos(omega * t) + fit.sine * Math.sin(omega * t) + fit.offset;
}

/** Gaussian elimination with partial pivoting on the leading `size`×`size` block of a 4×4 matrix. */
function solveSymmetric(matrix: Float64Array, rhs: Float64Array, size: number): Float64Array {
  const m = Float64Array.from(matrix);
  const v = Float64Array.from(rhs);
  for (let col = 0; col < size; col++) {
    let pivot = col;
    for (let r = col + 1; r < size; r++) if (Math.abs(m[r * 4 + col]) > Math.abs(m[pivot * 4 + col])) pivot = r;
    if (m[pivot * 4 + col] === 0) {
      throw new InputError('samples', 'a record with a tone in it (the sine fit is singular)', 'the fit has no unique solution');
    }
    if (pivot !== col) {
      for (let j = 0; j < size; j++) [m[col * 4 + j], m[pivot * 4 + j]] = [m[pivot * 4 + j], m[col * 4 + j]];
      [v[col], v[pivot]] = [v[pivot], v[col]];
    }
    for (let r = col + 1; r < size; r++) {
      const factor = m[r * 4 + col] / m[col * 4 + col];
      for (let j = col; j < size; j++) m[r * 4 + j] -= factor * m[col * 4 + j];
      v[r] -= factor * v[col];
    }
  }
  const x = new Float64Array(4);
  for (let r = size - 1; r >= 0; r--) {
    let sum = v[r];
    for (let j = r + 1; j < size; j++) sum -= m[r * 4 + j] * x[j];
    x[r] = sum / m[r * 4 + r];
  }
  return x;
}
