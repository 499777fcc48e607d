/**
 * A pn junction's ideal current I = Is·(exp(v/(n·VT)) − 1) and its conductance,
 * evaluated without overflow, plus Newton step limiting.
 */

/** Above this exponent the exponential continues as a straight line (no overflow, still monotonic). */
export const EXPONENT_LIMIT = 80;
const EXP_AT_LIMIT = Math.exp(EXPONENT_LIMIT);
/** Below this exponent exp() is under 5e-18 of Is: treat the junction as fully reverse-biased. */
export const EXPONENT_FLOOR = -40;

/** Result slots, reused so evaluation allocates nothing. */
export class JunctionPoint {
  amperes = 0;
  siemens = 0;
  /** Is·e^(v/nVT) where the exponential applies, 0 where the model is constant or straight. */
  exponential = 0;
}

export function evaluateJunction(volts: number, saturationAmperes: number, emissionVolts: number, out: JunctionPoint): void {
  const exponent = volts / emissionVolts;
  if (exponent < EXPONENT_FLOOR) {
    out.amperes = -saturationAmperes;
    out.siemens = 0;
    out.exponential = 0;
    return;
  }
  if (exponent > EXPONENT_LIMIT) {
    out.amperes = saturationAmperes * (EXP_AT_LIMIT * (1 + exponent - EXPONENT_LIMIT) - 1);
    out.siemens = (saturationAmperes * EXP_AT_LIMIT) / emissionVolts;
    out.exponential = 0;
    return;
  }
  const e = Math.exp(exponent);
  out.amperes = saturationAmperes * (e - 1);
  out.siemens = (saturationAmperes * e) / emissionVolts;
  out.exponential = saturationAmperes * e;
}

/**
 * e^x − 1 − x at small x: the part of a junction's exponential its tangent at a held point leaves
 * out, x = Δv/nVT away from it. The Taylor series to x⁵ (A&S 4.2.1); its remainder, about x⁶/720,
 * is 1e-14 at the |x| ≤ 0.014 a held linearisation allows and 2e-11 at |x| = 0.05. The generated
 * kernels write the same sum (`exponentialRemainderCode`).
 */
export function exponentialRemainder(x: number): number {
  return x * x * (1 / 2 + x * (1 / 6 + x * (1 / 24 + x * (1 / 120))));
}

/**
 * How far a junction's linearisation at `linearisedVolts` is off at `volts`, as the relative
 * error of its current, ½(Δv/nVT)² (the exponential's Taylor remainder). Zero when both lie
 * below the exponent floor: there the model's current is the constant −Is, exactly linear.
 */
export function junctionLinearisationError(volts: number, linearisedVolts: number, emissionVolts: number): number {
  const floor = EXPONENT_FLOOR * emissionVolts;
  if (volts < floor && linearisedVolts < floor) return 0;
  const d = (volts - linearisedVolts) / emissionVolts;
  return 0.5 * d * d;
}

/**
 * Critical voltage above which Newton steps are limited:
 * Vcrit = n·VT·ln(n·VT / (√2·Is)) (Nagel, "SPICE2: A computer program to
 * simulate semiconductor circuits", UCB ERL-M520, 1975).
 */
export function criticalVolts(saturationAmperes: number, emissionVolts: number): number {
  return emissionVolts * Math.log(emissionVolts / (Math.SQRT2 * saturationAmperes));
}

/**
 * Limits a junction's Newton update (Nagel 1975): above Vcrit a large step is
 * replaced by the step that makes the current change logarithmically.
 * Returns the voltage to evaluate at; `limited` tells whether it changed.
 */
export function limitJunctionStep(
  proposedVolts: number,
  previousVolts: number,
  emissionVolts: number,
  criticalVoltage: number,
  flag: { limited: boolean },
): number {
  if (proposedVolts > criticalVoltage && Math.abs(proposedVolts - previousVolts) > 2 * emissionVolts) {
    flag.limited = true;
    if (previousVolts > 0) {
      const argument = 1 + (proposedVolts - previousVolts) / emissionVolts;
      return argument > 0 ? previousVolts + emissionVolts * Math.log(argument) : criticalVoltage;
    }
    return emissionVolts * Math.log(proposedVolts / emissionVolts);
  }
  return proposedVolts;
}

/** Forward current above which a junction counts as conducting when naming a region, in amperes. */
export const CONDUCTING_AMPERES = 1e-7;

/** Voltage at which the junction carries CONDUCTING_AMPERES. */
export function conductingVolts(saturationAmperes: number, emissionVolts: number): number {
  return emissionVolts * Math.log(1 + CONDUCTING_AMPERES / saturationAmperes);
}
