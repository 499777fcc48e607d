/**
 * Integration of a state s (a charge or a flux) whose derivative d feeds the
 * circuit: at the new step d = a0·s + history, with history formed from the
 * stored past. Coefficients (Lambert, "Numerical Methods for Ordinary
 * Differential Systems", Wiley 1991, ch. 3; variable-step BDF2 as in
 * Brenan, Campbell & Petzold, "Numerical Solution of IVPs in DAEs", ch. 3):
 *   dc:   d = 0
 *   be:   d = (s − s₁)/h
 *   tr:   d = (2/h)(s − s₁) − d₁
 *   bdf2: d = a0·s + a1·s₁ + a2·s₂, r = h/h₁,
 *         a0 = (1+2r)/(h(1+r)), a1 = −(1+r)/h, a2 = r²/(h(1+r)).
 * The trapezoidal rule is A-stable but not L-stable (its stiff-mode factor
 * tends to −1 and rings at sharp edges); backward Euler and BDF2 damp them.
 */
export type IntegrationMethod = 'dc' | 'be' | 'tr' | 'bdf2';

export class Integrator {
  method: IntegrationMethod = 'dc';
  /** Current step size in seconds (0 for dc). */
  stepSeconds = 0;
  a0 = 0;
  a1 = 0;
  a2 = 0;

  /** Sets the coefficients for a step of `stepSeconds` after one of `previousStepSeconds`. */
  set(method: IntegrationMethod, stepSeconds: number, previousStepSeconds: number): void {
    this.method = method;
    this.stepSeconds = stepSeconds;
    const h = stepSeconds;
    switch (method) {
      case 'dc':
        this.a0 = this.a1 = this.a2 = 0;
        this.stepSeconds = 0;
        break;
      case 'be':
        this.a0 = 1 / h;
        this.a1 = -1 / h;
        this.a2 = 0;
        break;
      case 'tr':
        this.a0 = 2 / h;
        this.a1 = -2 / h;
        this.a2 = 0;
        break;
      case 'bdf2': {
        const r = h / previousStepSeconds;
        this.a0 = (1 + 2 * r) / (h * (1 + r));
        this.a1 = -(1 + r) / h;
        this.a2 = (r * r) / (h * (1 + r));
        break;
      }
    }
  }

  /** History term for a state with past values s₁, s₂ and past derivative d₁. */
  history(s1: number, s2: number, d1: number): number {
    switch (this.method) {
      case 'dc':
        return 0;
      case 'be':
        return this.a1 * s1;
      case 'tr':
        return this.a1 * s1 - d1;
      case 'bdf2':
        return this.a1 * s1 + this.a2 * s2;
    }
  }
}

/** One stored state (charge or flux) with its derivative and past. */
export class StateHistory {
  s1 = 0;
  s2 = 0;
  d1 = 0;
  /** history term for the step being solved */
  pending = 0;

  /** After a converged step with state s: derivative then shift. */
  accept(s: number, integrator: Integrator): number {
    if (integrator.method === 'dc') {
      this.settle(s);
      return 0;
    }
    const d = integrator.a0 * s + this.pending;
    this.s2 = this.s1;
    this.s1 = s;
    this.d1 = d;
    return d;
  }

  /** Sets the state at a DC solution (no motion). */
  settle(s: number): void {
    this.s1 = s;
    this.s2 = s;
    this.d1 = 0;
  }
}
