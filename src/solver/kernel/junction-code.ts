import { EXPONENT_FLOOR, EXPONENT_LIMIT } from '../../devices/junction.ts';
import { int, type ConstantPool } from './literals.ts';
import type { JunctionParameters } from './plan.ts';

/**
 * Code that evaluates a junction's current `amperes` and conductance `siemens`
 * (declared here) at voltage variable `volts`, as `evaluateJunction` does:
 * straight-line continuation above the exponent limit, and no exponential at all
 * for a strongly reverse-biased junction. With `exponential`, also declares that
 * variable as Is·e^(v/nVT) where the exponential applies (0 where the model is
 * constant or straight).
 */
export function junctionCode(pool: ConstantPool, volts: string, amperes: string, siemens: string, j: JunctionParameters, exponential?: string): string {
  const is = pool.ref(j.saturationAmperes);
  const nvt = pool.ref(j.emissionVolts);
  const expAtLimit = Math.exp(EXPONENT_LIMIT);
  return [
    `let ${amperes} = -${is}, ${siemens} = 0;`,
    exponential ? `let ${exponential} = 0;` : '',
    `{ const x = ${volts} / ${nvt};`,
    `if (x > ${int(EXPONENT_LIMIT)}) { ${amperes} = ${is} * (${pool.ref(expAtLimit)} * (1 + x - ${int(EXPONENT_LIMIT)}) - 1); ${siemens} = ${pool.ref(j.saturationAmperes * expAtLimit)} / ${nvt}; }`,
    `else if (x >= ${int(EXPONENT_FLOOR)}) { const e = Math.exp(x); ${amperes} = ${is} * (e - 1); ${siemens} = (${is} * e) / ${nvt};${exponential ? ` ${exponential} = ${is} * e;` : ''} } }`,
  ].join('\n');
}

/** Code for `exponentialRemainder(x)` (devices/junction.ts): the same sum, in the same order. */
export function exponentialRemainderCode(pool: ConstantPool, x: string): string {
  return `${x} * ${x} * (${pool.ref(1 / 2)} + ${x} * (${pool.ref(1 / 6)} + ${x} * (${pool.ref(1 / 24)} + ${x} * ${pool.ref(1 / 120)})))`;
}

/**
 * Code that limits the Newton update of junction voltage variable `volts` against
 * the previous linearisation point `previous`, as `limitJunctionStep` does
 * (Nagel 1975), setting `limited` when it changes the step.
 */
export function limitCode(pool: ConstantPool, volts: string, previous: string, j: JunctionParameters): string {
  const nvt = pool.ref(j.emissionVolts);
  const critical = pool.ref(j.criticalVolts);
  return [
    // Both comparisons every time (& rather than &&): see the predictor in generate.ts.
    `if ((${volts} > ${critical}) & (Math.abs(${volts} - ${previous}) > ${pool.ref(2 * j.emissionVolts)})) {`,
    'limited = true;',
    `if (${previous} > 0) { const arg = 1 + (${volts} - ${previous}) / ${nvt}; ${volts} = arg > 0 ? ${previous} + ${nvt} * Math.log(arg) : ${critical}; }`,
    `else ${volts} = ${nvt} * Math.log(${volts} / ${nvt});`,
    '}',
  ].join('\n');
}
