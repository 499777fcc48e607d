/**
 * Kaiser window and Kaiser's empirical design formulas (J. F. Kaiser, "Nonrecursive digital filter
 * design using the I0-sinh window function", Proc. IEEE ISCAS 1974; restated in Oppenheim & Schafer,
 * "Discrete-Time Signal Processing", 3rd ed., 2010, §7.5.3, eqs. 7.62–7.63).
 */

/** Zeroth-order modified Bessel function of the first kind, I0(x) = Σ ((x/2)^k / k!)^2. */
export function besselI0(x: number): number {
  const quarterSquare = (x * x) / 4;
  let term = 1;
  let sum = 1;
  // Terms fall off factorially once k > x/2; stop when the next adds nothing at double precision.
  for (let k = 1; k < 500; k++) {
    term *= quarterSquare / (k * k);
    sum += term;
    if (term < sum * 1e-17) break;
  }
  return sum;
}

/**
 * Shape parameter β for a stopband attenuation of `attenuationDb` (A = −20·log10 δ):
 * β = 0.1102 (A − 8.7) for A > 50; 0.5842 (A − 21)^0.4 + 0.07886 (A − 21) for 21 ≤ A ≤ 50; 0 below.
 */
export function kaiserBeta(attenuationDb: number): number {
  if (attenuationDb > 50) return 0.1102 * (attenuationDb - 8.7);
  if (attenuationDb >= 21) return 0.5842 * (attenuationDb - 21) ** 0.4 + 0.07886 * (attenuationDb - 21);
  return 0;
}

/**
 * Filter order M (length M + 1) for attenuation A and transition width Δω in radians per sample:
 * M = (A − 8) / (2.285 Δω), rounded up.
 */
export function kaiserOrder(attenuationDb: number, transitionRadians: number): number {
  return Math.ceil((attenuationDb - 8) / (2.285 * transitionRadians));
}

/** Kaiser window value at offset `x` from the centre, in units of the half-length (|x| ≤ 1). */
export function kaiserAt(x: number, beta: number, i0OfBeta = besselI0(beta)): number {
  const inside = 1 - x * x;
  if (inside < 0) return 0;
  return besselI0(beta * Math.sqrt(inside)) / i0OfBeta;
}

/** Kaiser window of `length` points: w[n] = I0(β √(1 − (2n/M − 1)²)) / I0(β), M = length − 1. */
export function kaiserWindow(length: number, beta: number): Float64Array {
  const window = new Float64Array(length);
  if (length === 1) {
    window[0] = 1;
    return window;
  }
  const order = length - 1;
  const i0OfBeta = besselI0(beta);
  for (let n = 0; n < length; n++) window[n] = kaiserAt((2 * n) / order - 1, beta, i0OfBeta);
  return window;
}
