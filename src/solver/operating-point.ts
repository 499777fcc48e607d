import { ConvergenceError } from '../errors.ts';
import type { Newton } from './newton.ts';
import type { CircuitSystem } from './system.ts';

/** gmin-stepping ladder: node shunts from 10 mS down by decades (common practice, no source). */
const SHUNT_LADDER_SIEMENS = [1e-2, 1e-3, 1e-4, 1e-5, 1e-6, 1e-7, 1e-8, 1e-9, 1e-10, 1e-11, 1e-12];

export type OperatingPointMethod = 'newton' | 'gmin-stepping' | 'source-stepping';

/**
 * DC operating point: capacitors open, inductors shorted, sources at t = 0.
 * Plain Newton first; if that fails, gmin stepping (a shunt from every node to
 * ground, relaxed a decade at a time); then source stepping (all sources
 * ramped from 0 to 100 %). Throws a ConvergenceError naming the node and part
 * most at fault when all three fail. `x` receives the solution.
 */
export function solveOperatingPoint(system: CircuitSystem, newton: Newton, x: Float64Array): OperatingPointMethod {
  system.integrator.set('dc', 0, 0);
  system.nodeShuntSiemens = 0;
  system.stampConstants();
  system.beginStep(0, 1);
  x.fill(0);
  let outcome = newton.solve(x, true);
  if (outcome.converged) return finish(system, x, 'newton');

  if (gminStepping(system, newton, x)) return finish(system, x, 'gmin-stepping');
  if (sourceStepping(system, newton, x)) return finish(system, x, 'source-stepping');

  outcome = newton.outcome;
  const node = outcome.worstUnknown >= 0 ? system.unknownNames[outcome.worstUnknown] : null;
  if (outcome.singular) {
    const where = outcome.worstUnknown >= 0 ? system.describeUnknown(outcome.worstUnknown) : 'an unknown';
    throw new ConvergenceError(
      `no DC operating point: the circuit matrix is singular at ${where} (voltage sources in parallel or in a loop, ` +
        `or a node whose voltage nothing sets)`,
      0,
      node,
      null,
    );
  }
  const part = system.mostActivePart();
  throw new ConvergenceError(
    `no DC operating point found (plain Newton, gmin stepping and source stepping all failed)` +
      `${node ? `; ${system.describeUnknown(outcome.worstUnknown)} moved most` : ''}${part ? `, part ${part} most at fault` : ''}`,
    0,
    node,
    part,
  );
}

function finish(system: CircuitSystem, x: Float64Array, method: OperatingPointMethod): OperatingPointMethod {
  system.accept(x);
  return method;
}

function gminStepping(system: CircuitSystem, newton: Newton, x: Float64Array): boolean {
  x.fill(0);
  let first = true;
  for (const shunt of [...SHUNT_LADDER_SIEMENS, 0]) {
    system.nodeShuntSiemens = shunt;
    system.stampConstants();
    if (!newton.solve(x, first).converged) {
      system.nodeShuntSiemens = 0;
      system.stampConstants();
      return false;
    }
    first = false;
  }
  return true;
}

function sourceStepping(system: CircuitSystem, newton: Newton, x: Float64Array): boolean {
  system.nodeShuntSiemens = 0;
  system.stampConstants();
  const saved = new Float64Array(x.length);
  x.fill(0);
  system.beginStep(0, 0);
  if (!newton.solve(x, true).converged) return false;
  let scale = 0;
  let increment = 0.1;
  while (scale < 1) {
    const target = Math.min(1, scale + increment);
    saved.set(x);
    system.beginStep(0, target);
    if (newton.solve(x, false).converged) {
      scale = target;
      increment = Math.min(0.5, increment * 2);
    } else {
      x.set(saved);
      increment /= 4;
      if (increment < 1e-7) return false;
    }
  }
  return true;
}
