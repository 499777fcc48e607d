/**
 * Test-only reference: modified Bessel functions of the first kind by their
 * power series I_n(x) = Σ_k (x/2)^(2k+n) / (k!·(k+n)!) (Abramowitz & Stegun,
 * Handbook of Mathematical Functions, 9.6.10). Terms are all positive, so the
 * sum is accurate to rounding for the small arguments the tests use.
 */
export function besselI(order: number, x: number): number {
  const half = x / 2;
  // First term (x/2)^n / n!
  let term = 1;
  for (let i = 1; i <= order; i++) term *= half / i;
  let sum = term;
  const square = half * half;
  for (let k = 1; k < 500; k++) {
    term *= square / (k * (k + order));
    sum += term;
    if (term < 1e-18 * sum) break;
  }
  return sum;
}
