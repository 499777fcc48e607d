import { InputError } from '../errors.ts';
import type { Simulator } from './simulator.ts';

export interface TransientRequest {
  stopSeconds: number;
  /** Output interval; in fixed mode also the integration step. */
  stepSeconds: number;
  /** 'fixed': one step per output point (audio); 'adaptive': error-controlled steps, output on the grid. */
  mode: 'fixed' | 'adaptive';
  /** Local truncation error allowed per step, relative and absolute (volts). */
  truncationRelative?: number;
  truncationVolts?: number;
}

export interface TransientStats {
  acceptedSteps: number;
  rejectedSteps: number;
  outputPoints: number;
}

/** Most output points one run may produce (keeps a typo in --stop from filling the disk). */
export const MAX_OUTPUT_POINTS = 50_000_000;

/**
 * Runs a transient from the DC operating point. `onPoint` is called at t = 0
 * and at every multiple of `stepSeconds` up to `stopSeconds`, with the solution.
 */
export function runTransient(
  simulator: Simulator,
  request: TransientRequest,
  onPoint: (seconds: number, x: Float64Array) => void,
): TransientStats {
  const { stopSeconds, stepSeconds } = request;
  if (!(stopSeconds > 0) || !Number.isFinite(stopSeconds)) throw new InputError('stop', 'a positive time in seconds', `got ${stopSeconds}`);
  if (!(stepSeconds > 0) || !Number.isFinite(stepSeconds)) throw new InputError('step', 'a positive time in seconds', `got ${stepSeconds}`);
  const points = Math.round(stopSeconds / stepSeconds);
  if (points < 1) throw new InputError('step', `a step no longer than the stop time (${stopSeconds} s)`, `got ${stepSeconds}`);
  if (points > MAX_OUTPUT_POINTS) {
    throw new InputError('step', `at most ${MAX_OUTPUT_POINTS} output points`, `${stopSeconds} s / ${stepSeconds} s gives ${points}`);
  }
  simulator.operatingPoint();
  onPoint(0, simulator.x);
  const breakpoints = simulator.system.breakpoints(stopSeconds);
  return request.mode === 'fixed'
    ? fixedSteps(simulator, points, stepSeconds, breakpoints, onPoint)
    : adaptiveSteps(simulator, request, points, breakpoints, onPoint);
}

function fixedSteps(
  simulator: Simulator,
  points: number,
  stepSeconds: number,
  breakpoints: number[],
  onPoint: (seconds: number, x: Float64Array) => void,
): TransientStats {
  let next = 0;
  let accepted = 0;
  for (let n = 1; n <= points; n++) {
    const target = n * stepSeconds;
    // A corner inside the step: land on it, then restart the integrator there.
    while (next < breakpoints.length && breakpoints[next] <= target) {
      const corner = breakpoints[next++];
      const gap = corner - simulator.timeSeconds;
      if (gap > 1e-9 * stepSeconds && target - corner > 1e-9 * stepSeconds) {
        simulator.step(gap, corner);
        accepted++;
      }
      simulator.markBreakpoint();
    }
    simulator.step(target - simulator.timeSeconds, target);
    accepted++;
    onPoint(target, simulator.x);
  }
  return { acceptedSteps: accepted, rejectedSteps: 0, outputPoints: points + 1 };
}

/**
 * Error-controlled steps. The local truncation error is estimated from the
 * difference between the corrector and a quadratic predictor (Milne's device;
 * Lambert 1991, §4.3): LTE ≈ C/(1 + C)·|x_c − x_p| with C = 1/12 for the
 * trapezoidal rule and 2/9 for BDF2, taking the predictor's own error
 * constant as 1 (equal steps). New step h·(tol/LTE)^(1/3), within ¼× and 2×.
 */
function adaptiveSteps(
  simulator: Simulator,
  request: TransientRequest,
  points: number,
  breakpoints: number[],
  onPoint: (seconds: number, x: Float64Array) => void,
): TransientStats {
  const { stepSeconds } = request;
  const relative = request.truncationRelative ?? 1e-4;
  const absolute = request.truncationVolts ?? 1e-6;
  const errorConstant = simulator.method === 'tr' ? 1 / 12 : 2 / 9;
  const factor = errorConstant / (1 + errorConstant);
  const size = simulator.system.nodeCount;
  const history = [new Float64Array(simulator.x), new Float64Array(simulator.x), new Float64Array(simulator.x)];
  const times = [0, 0, 0];
  let known = 1;
  const predicted = new Float64Array(simulator.x.length);
  const minimumStep = stepSeconds * 1e-9;
  let h = stepSeconds / 16;
  let accepted = 0;
  let rejected = 0;
  let output = 1;
  let nextCorner = 0;
  while (output <= points) {
    const t = simulator.timeSeconds;
    const outputTime = output * stepSeconds;
    let target = Math.min(t + h, outputTime);
    let atCorner = false;
    while (nextCorner < breakpoints.length && breakpoints[nextCorner] <= t) nextCorner++;
    if (nextCorner < breakpoints.length && breakpoints[nextCorner] <= target) {
      target = breakpoints[nextCorner];
      atCorner = true;
    }
    if (outputTime - target < minimumStep) target = outputTime;
    const step = target - t;
    if (!simulator.solveStep(step, target)) {
      rejected++;
      h = step / 8;
      if (h < minimumStep) simulator.step(step, target); // throws with the blame if it cannot get through
      continue;
    }
    const trial = simulator.trialSolution;
    if (known >= 3) {
      extrapolate(history, times, target, predicted, size);
      let ratio = 0;
      for (let i = 0; i < size; i++) {
        const xi = trial[i];
        const tolerance = relative * Math.abs(xi) + absolute;
        const r = (factor * Math.abs(xi - predicted[i])) / tolerance;
        if (r > ratio) ratio = r;
      }
      if (ratio > 1 && step > minimumStep * 16) {
        rejected++;
        h = step * Math.max(0.25, 0.9 * ratio ** (-1 / 3));
        continue;
      }
      h = step * Math.min(2, 0.9 * Math.max(ratio, 1e-6) ** (-1 / 3));
    } else {
      h = step * 2;
    }
    h = Math.min(h, stepSeconds);
    simulator.commitStep();
    accepted++;
    history.unshift(history.pop()!);
    history[0].set(simulator.x);
    times.unshift(times.pop()!);
    times[0] = target;
    known++;
    if (target === outputTime) {
      onPoint(outputTime, simulator.x);
      output++;
    }
    if (atCorner) {
      simulator.markBreakpoint();
      known = 1;
      h = Math.min(h, stepSeconds / 16);
    }
  }
  return { acceptedSteps: accepted, rejectedSteps: rejected, outputPoints: points + 1 };
}

/** Quadratic through the last three accepted points, evaluated at `seconds` (Lagrange form). */
function extrapolate(history: Float64Array[], times: number[], seconds: number, out: Float64Array, size: number): void {
  const [t0, t1, t2] = times;
  const l0 = ((seconds - t1) * (seconds - t2)) / ((t0 - t1) * (t0 - t2));
  const l1 = ((seconds - t0) * (seconds - t2)) / ((t1 - t0) * (t1 - t2));
  const l2 = ((seconds - t0) * (seconds - t1)) / ((t2 - t0) * (t2 - t1));
  const [x0, x1, x2] = history;
  for (let i = 0; i < size; i++) out[i] = l0 * x0[i] + l1 * x1[i] + l2 * x2[i];
}
