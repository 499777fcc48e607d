import type { CircuitSystem } from './system.ts';

/** Convergence tolerances of the Newton iteration. */
export interface NewtonTolerances {
  /** Relative tolerance on every unknown. */
  relative: number;
  /** Absolute tolerance on node voltages, volts. */
  volts: number;
  /** Absolute tolerance on branch currents, amperes. */
  amperes: number;
  /** Iterations before giving up. */
  maxIterations: number;
  /**
   * Time steps only: accept after an iteration whose linearisation is off by less than this
   * relative junction-current error at the new solution, ½(Δv/nVT)² (the exponential's Taylor
   * remainder), even if the update itself was larger than the tolerance: Newton's quadratic
   * convergence makes the next update negligible then. 0 = never.
   */
  quadraticAcceptance: number;
  /**
   * Time steps: first solve the step on the last step's junction linearisation and factors (no
   * junction evaluated, nothing factored) and keep that answer when every junction lies within
   * this bound, ½(Δv/nVT)², of the voltage it was linearised at: the same test as
   * `quadraticAcceptance`, against an older linearisation point. 0 = never. The general loop
   * and the generated kernels both do it; the dense reference does not.
   */
  reuseAcceptance: number;
  /**
   * A step kept on a held linearisation also takes one chord step on the held factors for the
   * junctions' curvature (no exponential: a short series about the held point), which takes its
   * error from ½(Δv/nVT)² to about ½(Δv/nVT)³. Off only to show what it buys.
   */
  reuseCorrection: boolean;
}

export const DEFAULT_TOLERANCES: NewtonTolerances = { relative: 1e-6, volts: 1e-7, amperes: 1e-12, maxIterations: 60, quadraticAcceptance: 1e-9, reuseAcceptance: 0, reuseCorrection: true };
/**
 * For rendering audio through the link: a step is accepted once every junction's linearisation
 * is within 1e-4 of its current. Against no early acceptance this changes the far end of demo (a)
 * by 1.1e-7 (relative rms, 4 s of normal speech; demo (b) 9.6e-8) and by 3.6e-5 when a shout
 * cuts the LED off 1273 times in 3 s, where the error of the step itself is 2.1e-3: early
 * acceptance stays at least 50× below the step error. Both circuits of demo (a) then take
 * 1.00 Newton iterations per step on normal speech, 1.22 and 1.35 in the shout (1e-3 gave
 * 1.11 and 1.22 but 3.0e-4 of error there). Tone THD at 60, 75 and 85 dB SPL agrees with a
 * bound of 1e-6 to 0.0001 dB.
 *
 * Both step loops also keep a step solved on the last step's linearisation, chord-corrected,
 * when every junction is within ½(Δv/nVT)² ≤ 3e-5 of it: 94 % of transmitter and 49 % of receiver
 * steps on demo (a)'s normal speech. Against fresh linearisation every step this changes the far
 * end by 9.3e-7 there (demo (b) 4.6e-7; the shout 1.2e-5) and tone THD at 60, 75 and 85 dB SPL by
 * 0.0008, 0.0003 and 0.0000 dB. A band of 1e-4 reused more (97 %, 60 %) but moved the 60 dB THD
 * by 0.16 dB, even with the chord step; without it, 1e-4 put the far end 4.3e-4 from the reference.
 */
export const AUDIO_TOLERANCES: NewtonTolerances = { ...DEFAULT_TOLERANCES, quadraticAcceptance: 1e-4, reuseAcceptance: 3e-5, reuseCorrection: true };
export const TIGHT_TOLERANCES: NewtonTolerances = { relative: 1e-10, volts: 1e-12, amperes: 1e-16, maxIterations: 200, quadraticAcceptance: 0, reuseAcceptance: 0, reuseCorrection: true };

/** A step that took more iterations than this switches the predictor off for the next one. */
export const HARD_STEP_ITERATIONS = 5;

export interface NewtonOutcome {
  converged: boolean;
  iterations: number;
  /** Unknown with the largest update relative to its tolerance in the last iteration. */
  worstUnknown: number;
  /** The matrix was singular. */
  singular: boolean;
}

/**
 * Newton–Raphson on the stamped system: solve the linearised circuit, repeat
 * until no unknown moves more than its tolerance and no junction step was
 * limited. `x` holds the starting guess and receives the answer.
 */
export class Newton {
  private readonly next: Float64Array;
  readonly outcome: NewtonOutcome = { converged: false, iterations: 0, worstUnknown: -1, singular: false };
  /** Newton iterations since construction (for the benchmark). */
  totalIterations = 0;

  constructor(
    private readonly system: CircuitSystem,
    public tolerances: NewtonTolerances = DEFAULT_TOLERANCES,
  ) {
    this.next = new Float64Array(system.size + 1);
  }

  /** `timeStep`: a transient step (quadratic acceptance allowed), not a DC solve. */
  solve(x: Float64Array, initialiseJunctions = false, timeStep = false): NewtonOutcome {
    const system = this.system;
    const next = this.next;
    const out = this.outcome;
    const { relative, volts, amperes, maxIterations } = this.tolerances;
    const quadratic = timeStep ? this.tolerances.quadraticAcceptance : 0;
    const nodeCount = system.nodeCount;
    const size = system.size;
    const hasNonlinear = system.nonlinearDevices.length > 0;
    out.converged = false;
    out.singular = false;
    out.worstUnknown = -1;
    system.iteration.initialiseJunctions = initialiseJunctions;
    for (let iteration = 1; iteration <= maxIterations; iteration++) {
      out.iterations = iteration;
      this.totalIterations++;
      if (!system.iterate(x, next)) {
        out.singular = true;
        out.worstUnknown = system.matrix.singularUnknown;
        return out;
      }
      let worstRatio = 0;
      let worst = -1;
      let finite = true;
      for (let i = 0; i < size; i++) {
        const a = next[i];
        const b = x[i];
        if (!Number.isFinite(a)) {
          finite = false;
          worst = i;
          break;
        }
        const tolerance = relative * Math.max(Math.abs(a), Math.abs(b)) + (i < nodeCount ? volts : amperes);
        const ratio = Math.abs(a - b) / tolerance;
        if (ratio > worstRatio) {
          worstRatio = ratio;
          worst = i;
        }
      }
      out.worstUnknown = worst;
      if (!finite) return out;
      x.set(next);
      const wasInitialising = system.iteration.initialiseJunctions;
      system.iteration.initialiseJunctions = false;
      if (!hasNonlinear) {
        out.converged = true;
        return out;
      }
      if (system.iteration.limited || wasInitialising) continue;
      if (worstRatio <= 1 || (quadratic > 0 && system.linearisationError(x) <= quadratic)) {
        out.converged = true;
        return out;
      }
    }
    return out;
  }
}
