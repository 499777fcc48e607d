/**
 * Test-only reference: the principal branch of the Lambert W function and the
 * exact current of a diode in series with a resistor built on it.
 */

/**
 * W0(exp(y)) for real y, i.e. the w > 0 with w + ln w = y (taking logarithms of
 * w·e^w = z with z = e^y). Working with y instead of z keeps arguments like
 * exp(200) from overflowing. Halley's iteration on f(w) = w + ln w − y,
 * f' = 1 + 1/w, f'' = −1/w² (Corless et al., "On the Lambert W function",
 * Adv. Comput. Math. 5, 1996, §4 for the method).
 */
export function lambertW0OfExp(y: number): number {
  // Start: w ≈ y − ln y for large y; w ≈ e^y for very negative y (W(z) ≈ z as z → 0).
  let w = y > 1 ? y - Math.log(y) : y > -20 ? Math.max(1e-300, Math.exp(y) / (1 + Math.exp(y))) : Math.exp(y);
  if (y < -700) return Math.exp(y); // W(z) = z to double precision for tiny z
  for (let i = 0; i < 100; i++) {
    const f = w + Math.log(w) - y;
    const d1 = 1 + 1 / w;
    const d2 = -1 / (w * w);
    const step = (2 * f * d1) / (2 * d1 * d1 - f * d2);
    let next = w - step;
    if (!(next > 0)) next = w / 2; // stay on the positive branch
    if (Math.abs(next - w) <= 1e-16 * Math.abs(next)) return next;
    w = next;
  }
  return w;
}

/** W0(z) for z ≥ 0. */
export function lambertW0(z: number): number {
  if (z === 0) return 0;
  return lambertW0OfExp(Math.log(z));
}

export interface SeriesDiodeSolution {
  /** Current through the resistor and diode, amperes. */
  amperes: number;
  /** Voltage across the diode, volts. */
  diodeVolts: number;
}

/**
 * A source V through R into a Shockley diode I = Is(exp(Vd/(nVT)) − 1), solved
 * exactly (Banwell & Jayakumar, "Exact analytical solution for current flow
 * through diode with series resistance", Electronics Letters 36(4), 2000):
 *   I = (nVT/R)·W0[(Is·R/(nVT))·exp((V + Is·R)/(nVT))] − Is.
 * The W argument is passed as its logarithm so large V cannot overflow.
 */
export function seriesDiodeCurrent(volts: number, ohms: number, saturationAmperes: number, emissionVolts: number): SeriesDiodeSolution {
  const logArgument = Math.log((saturationAmperes * ohms) / emissionVolts) + (volts + saturationAmperes * ohms) / emissionVolts;
  const amperes = (emissionVolts / ohms) * lambertW0OfExp(logArgument) - saturationAmperes;
  return { amperes, diodeVolts: volts - amperes * ohms };
}
