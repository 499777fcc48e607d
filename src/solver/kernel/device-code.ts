import { JUNCTION_GMIN_SIEMENS } from '../../devices/device.ts';
import { EXPONENT_FLOOR } from '../../devices/junction.ts';
import { exponentialRemainderCode, junctionCode, limitCode } from './junction-code.ts';
import { int, type ConstantPool } from './literals.ts';
import type { BjtPart, DiodePart } from './plan.ts';

/** What the device emitters write with. */
export interface DeviceCodeContext {
  pool: ConstantPool;
  emit(line: string): void;
  /** The code for the voltage of unknown `index` in the vector named by `prefix` ('0' for ground). */
  voltage(prefix: string, index: number): string;
  stampMatrix(row: number, col: number, op: '+=' | '-=', expr: string): void;
  stampRhs(row: number, op: '+=' | '-=', expr: string): void;
}

/** A junction device in the kernel: its part and its name prefix in the code. */
export interface JunctionDevice<P> {
  part: P;
  id: string;
  /**
   * Where its linearisation is held for later steps (`HELD_VALUES` numbers in the state
   * array: each junction's Is·e^(v/nVT), then a transistor's conductances); -1: not held.
   */
  heldAt: number;
}

/** Numbers held per device for the next steps' correction (see `diodeCorrection`, `bjtCorrection`). */
export const HELD_VALUES = { diode: 1, bjt: 4 } as const;

/**
 * The distance between two voltages of a junction in nVT, as it matters to the junction's current:
 * zero when both lie below the exponent floor, where the model's current is the constant −Is
 * (as `junctionLinearisationError` in devices/junction.ts has it for the general loop).
 */
function distance(c: DeviceCodeContext, a: string, b: string, j: { emissionVolts: number }): string {
  const floor = c.pool.ref(EXPONENT_FLOOR * j.emissionVolts);
  return `(${a} < ${floor} && ${b} < ${floor} ? 0 : Math.abs(${a} - ${b}) / ${c.pool.ref(j.emissionVolts)})`;
}

/**
 * A diode's Newton stamp, as `Diode.load` does it: limit the junction step, evaluate,
 * stamp the conductance and the equivalent current.
 */
export function diodeNewton(c: DeviceCodeContext, { part, id, heldAt }: JunctionDevice<DiodePart>): void {
  const gmin = c.pool.ref(JUNCTION_GMIN_SIEMENS);
  c.emit('{');
  c.emit(`let v = ${c.voltage('t', part.junction)} - ${c.voltage('t', part.cathode)};`);
  c.emit(limitCode(c.pool, 'v', `${id}v`, part));
  c.emit(`${id}v = v;`);
  c.emit(junctionCode(c.pool, 'v', 'I', 'G', part, heldAt >= 0 ? 'E' : undefined));
  if (heldAt >= 0) c.emit(`s[${int(heldAt)}] = E;`);
  c.emit(`const g = G + ${gmin}; const eq = I + ${gmin} * v - g * v;`);
  c.stampMatrix(part.junction, part.junction, '+=', 'g');
  c.stampMatrix(part.junction, part.cathode, '-=', 'g');
  c.stampMatrix(part.cathode, part.junction, '-=', 'g');
  c.stampMatrix(part.cathode, part.cathode, '+=', 'g');
  c.stampRhs(part.junction, '-=', 'eq');
  c.stampRhs(part.cathode, '+=', 'eq');
  c.emit('}');
}

/** The transistor's currents and partials at junction voltages `vbe`, `vbc` (NPN frame). */
function bjtCurrents(c: DeviceCodeContext, part: BjtPart, heldAt: number): void {
  const gmin = c.pool.ref(JUNCTION_GMIN_SIEMENS);
  const invEarly = c.pool.ref(part.inverseEarlyVolts);
  const invBf = c.pool.ref(part.inverseForwardBeta);
  const invBr = c.pool.ref(part.inverseReverseBeta);
  c.emit(junctionCode(c.pool, 'vbe', 'fI', 'fG', part, heldAt >= 0 ? 'fE' : undefined));
  c.emit(junctionCode(c.pool, 'vbc', 'rI', 'rG', part, heldAt >= 0 ? 'rE' : undefined));
  if (heldAt >= 0) c.emit(`s[${int(heldAt)}] = fE; s[${int(heldAt + 1)}] = fG; s[${int(heldAt + 2)}] = rE; s[${int(heldAt + 3)}] = rG;`);
  c.emit(`const early = 1 - vbc * ${invEarly}; const transport = fI - rI;`);
  c.emit(`const ic = transport * early - rI * ${invBr} - ${gmin} * vbc;`);
  c.emit(`const ib = fI * ${invBf} + rI * ${invBr} + ${gmin} * (vbe + vbc);`);
  c.emit(`const dIcDvbe = fG * early;`);
  c.emit(`const dIcDvbc = -rG * early - transport * ${invEarly} - rG * ${invBr} - ${gmin};`);
  c.emit(`const dIbDvbe = fG * ${invBf} + ${gmin};`);
  c.emit(`const dIbDvbc = rG * ${invBr} + ${gmin};`);
}

/** A transistor's Newton stamp, as `Bjt.load` does it. */
export function bjtNewton(c: DeviceCodeContext, { part, id, heldAt }: JunctionDevice<BjtPart>): void {
  const p = c.pool.ref(part.polarity);
  const { collector: col, base: b, emitter: e } = part;
  c.emit('{');
  c.emit(`const vb = ${c.voltage('t', b)};`);
  c.emit(`let vbe = ${p} * (vb - ${c.voltage('t', e)}); let vbc = ${p} * (vb - ${c.voltage('t', col)});`);
  c.emit(limitCode(c.pool, 'vbe', `${id}be`, part));
  c.emit(limitCode(c.pool, 'vbc', `${id}bc`, part));
  c.emit(`${id}be = vbe; ${id}bc = vbc;`);
  bjtCurrents(c, part, heldAt);
  c.stampMatrix(col, col, '-=', 'dIcDvbc');
  c.stampMatrix(col, b, '+=', 'dIcDvbe + dIcDvbc');
  c.stampMatrix(col, e, '-=', 'dIcDvbe');
  c.stampMatrix(b, col, '-=', 'dIbDvbc');
  c.stampMatrix(b, b, '+=', 'dIbDvbe + dIbDvbc');
  c.stampMatrix(b, e, '-=', 'dIbDvbe');
  c.stampMatrix(e, col, '+=', 'dIcDvbc + dIbDvbc');
  c.stampMatrix(e, b, '-=', '(dIcDvbe + dIcDvbc + dIbDvbe + dIbDvbc)');
  c.stampMatrix(e, e, '+=', 'dIcDvbe + dIbDvbe');
  c.emit(`const eqC = ${p} * (ic - dIcDvbe * vbe - dIcDvbc * vbc);`);
  c.emit(`const eqB = ${p} * (ib - dIbDvbe * vbe - dIbDvbc * vbc);`);
  c.stampRhs(col, '-=', 'eqC');
  c.stampRhs(b, '-=', 'eqB');
  c.stampRhs(e, '+=', '(eqC + eqB)');
  c.emit('}');
}

/** The quadratic-acceptance term of a diode at the new iterate against its linearisation point, into `worst`. */
export function diodeLinearisationError(c: DeviceCodeContext, { part, id }: JunctionDevice<DiodePart>): void {
  c.emit(`{ const v = ${c.voltage('n', part.junction)} - ${c.voltage('n', part.cathode)}; const d = ${distance(c, 'v', `${id}v`, part)}; const r = 0.5 * (d * d); if (r > worst) worst = r; }`);
}

/** The same for a transistor (the larger of its two junctions). */
export function bjtLinearisationError(c: DeviceCodeContext, { part, id }: JunctionDevice<BjtPart>): void {
  const p = c.pool.ref(part.polarity);
  c.emit(`{ const vb = ${c.voltage('n', part.base)}; const vbe = ${p} * (vb - ${c.voltage('n', part.emitter)}); const vbc = ${p} * (vb - ${c.voltage('n', part.collector)});`);
  c.emit(`const be = ${distance(c, 'vbe', `${id}be`, part)}; const bc = ${distance(c, 'vbc', `${id}bc`, part)};`);
  c.emit('const r = 0.5 * (be * be > bc * bc ? be * be : bc * bc); if (r > worst) worst = r; }');
}

/**
 * A step solved on a held linearisation leaves each junction's exponential beyond its tangent out:
 * Is·e^(v₀/nVT)·(e^x − 1 − x) at x = (v − v₀)/nVT. These stamp that remainder, evaluated at the
 * new iterate `n` from the held Is·e^(v₀/nVT) (a short series, no exponential), into the right-hand
 * side `w` with the signs of the Newton stamps: one chord step on the held factors then takes
 * the linearisation error from ½x² down to about ½x³.
 */
export function diodeCorrection(c: DeviceCodeContext, { part, id, heldAt }: JunctionDevice<DiodePart>): void {
  c.emit(`{ const x = (${c.voltage('n', part.junction)} - ${c.voltage('n', part.cathode)} - ${id}v) / ${c.pool.ref(part.emissionVolts)};`);
  c.emit(`const dI = s[${int(heldAt)}] * (${exponentialRemainderCode(c.pool, 'x')});`);
  c.stampRhs(part.junction, '-=', 'dI');
  c.stampRhs(part.cathode, '+=', 'dI');
  c.emit('}');
}

/**
 * The same for a transistor: the remainders of its two junction currents, carried through the
 * model's Early factor and betas (the terms of ic and ib the tangent plane leaves out, exactly).
 */
export function bjtCorrection(c: DeviceCodeContext, { part, id, heldAt }: JunctionDevice<BjtPart>): void {
  const p = c.pool.ref(part.polarity);
  const nvt = c.pool.ref(part.emissionVolts);
  const invEarly = c.pool.ref(part.inverseEarlyVolts);
  const { collector: col, base: b, emitter: e } = part;
  c.emit(`{ const vb = ${c.voltage('n', b)}; const vbc = ${p} * (vb - ${c.voltage('n', col)});`);
  c.emit(`const dbe = ${p} * (vb - ${c.voltage('n', e)}) - ${id}be; const dbc = vbc - ${id}bc; const xf = dbe / ${nvt}; const xr = dbc / ${nvt};`);
  c.emit(`const dF = s[${int(heldAt)}] * (${exponentialRemainderCode(c.pool, 'xf')}); const dR = s[${int(heldAt + 2)}] * (${exponentialRemainderCode(c.pool, 'xr')});`);
  c.emit(`const dIc = (dF - dR) * (1 - vbc * ${invEarly}) - (s[${int(heldAt + 1)}] * dbe - s[${int(heldAt + 3)}] * dbc) * dbc * ${invEarly} - dR * ${c.pool.ref(part.inverseReverseBeta)};`);
  c.emit(`const dIb = dF * ${c.pool.ref(part.inverseForwardBeta)} + dR * ${c.pool.ref(part.inverseReverseBeta)};`);
  c.emit(`const eqC = ${p} * dIc; const eqB = ${p} * dIb;`);
  c.stampRhs(col, '-=', 'eqC');
  c.stampRhs(b, '-=', 'eqB');
  c.stampRhs(e, '+=', '(eqC + eqB)');
  c.emit('}');
}
