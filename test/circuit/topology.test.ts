import { describe, expect, it } from 'vitest';
import { BUILT_IN_MODELS } from '../../src/circuit/models.ts';
import { checkTopology } from '../../src/circuit/topology.ts';
import type { BjtModel, Circuit, Part, PhototransistorModel } from '../../src/circuit/types.ts';
import { InputError } from '../../src/errors.ts';

const R = (ref: string, a: string, b: string): Part => ({ ref, kind: 'resistor', pins: [a, b], value: 1000 });
const C = (ref: string, a: string, b: string): Part => ({ ref, kind: 'capacitor', pins: [a, b], value: 1e-6 });
const L = (ref: string, a: string, b: string): Part => ({ ref, kind: 'inductor', pins: [a, b], value: 1e-3 });
const V = (ref: string, plus: string, minus: string): Part => ({ ref, kind: 'voltage-source', pins: [plus, minus], dc: 1 });
const I = (ref: string, from: string, to: string): Part => ({ ref, kind: 'current-source', pins: [from, to], dc: 1e-3 });
const NPN = (ref: string, c: string, b: string, e: string): Part => ({
  ref,
  kind: 'npn',
  pins: [c, b, e],
  modelName: 'generic-npn',
  model: BUILT_IN_MODELS['generic-npn'] as BjtModel,
});

const circuit = (...parts: Part[]): Circuit => ({ temperatureCelsius: 27, parts });

function topologyError(c: Circuit, prefix?: string): InputError {
  try {
    checkTopology(c, prefix);
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    return error as InputError;
  }
  throw new Error('expected an InputError, but the topology check passed');
}

describe('checkTopology', () => {
  it('accepts a common-emitter stage whose base and collector reach ground only through the transistor and resistors', () => {
    expect(() =>
      checkTopology(circuit(V('VCC', 'vcc', 'gnd'), R('RC', 'vcc', 'c'), R('RB', 'vcc', 'b'), NPN('Q1', 'c', 'b', 'e'), R('RE', 'e', 'gnd'), C('CIN', 'in', 'b'), R('RIN', 'in', 'gnd'))),
    ).not.toThrow();
  });

  it('accepts a two-pin phototransistor as a DC path between collector and emitter', () => {
    const pt: Part = {
      ref: 'P1',
      kind: 'phototransistor',
      pins: ['rx', 'gnd'],
      modelName: 'generic-phototransistor',
      model: BUILT_IN_MODELS['generic-phototransistor'] as PhototransistorModel,
      light: { dc: 0 },
    };
    expect(() => checkTopology(circuit(pt, C('C1', 'rx', 'gnd')))).not.toThrow();
  });

  it('rejects a circuit without a "gnd" node and points out a look-alike', () => {
    const error = topologyError(circuit(V('V1', 'a', 'GND'), R('R1', 'a', 'GND')));
    expect(error.where).toBe('parts');
    expect(error.message).toMatch(/no pin is "gnd" \(node names are exact: "GND" is not ground\); expected at least one pin connected to "gnd"/);
  });

  it('rejects a node reached only through a capacitor, naming the node and the parts touching it', () => {
    const error = topologyError(circuit(V('V1', 'in', 'gnd'), C('C1', 'in', 'mid'), C('C2', 'mid', 'gnd')));
    expect(error.where).toBe('parts[1].pins[1]');
    expect(error.message).toMatch(/node "mid" has no DC path to ground; it touches C1 \(capacitor\), C2 \(capacitor\)/);
  });

  it('rejects a current source in series with a capacitor (a cut set of non-conducting parts)', () => {
    const error = topologyError(circuit(I('I1', 'gnd', 'x'), C('C1', 'x', 'gnd'), R('R1', 'gnd', 'y'), V('V1', 'y', 'gnd')));
    expect(error.where).toBe('parts[0].pins[1]');
    expect(error.message).toMatch(/node "x" has no DC path to ground; it touches I1 \(current-source\), C1 \(capacitor\)/);
  });

  it('rejects a separate island of resistors with no connection to ground', () => {
    const error = topologyError(circuit(V('V1', 'a', 'gnd'), R('R1', 'a', 'gnd'), R('R2', 'p', 'q'), R('R3', 'q', 'p')));
    expect(error.where).toBe('parts[2].pins[0]');
    expect(error.message).toMatch(/node "p" has no DC path to ground; it touches R2 \(resistor\), R3 \(resistor\)/);
  });

  it('rejects two voltage sources in parallel, naming both', () => {
    const error = topologyError(circuit(V('V1', 'a', 'gnd'), R('R1', 'a', 'gnd'), V('V2', 'a', 'gnd')));
    expect(error.where).toBe('parts[2]');
    expect(error.message).toMatch(/V1 \(voltage-source\), V2 \(voltage-source\) form a loop/);
  });

  it('rejects a loop of a voltage source and inductors, naming every part in the loop and none outside it', () => {
    const error = topologyError(
      circuit(R('R1', 'a', 'gnd'), V('V1', 'a', 'gnd'), L('L1', 'a', 'b'), L('L9', 'a', 'z'), R('R2', 'z', 'gnd'), L('L2', 'b', 'c'), V('V2', 'c', 'gnd')),
    );
    expect(error.where).toBe('parts[6]');
    expect(error.message).toMatch(/: L2 \(inductor\), L1 \(inductor\), V1 \(voltage-source\), V2 \(voltage-source\) form a loop; expected no loop made only of voltage sources and inductors/);
    expect(error.message).not.toMatch(/L9|R1|R2/);
  });

  it('rejects a voltage source with both pins on one node', () => {
    const error = topologyError(circuit(R('R1', 'a', 'gnd'), V('V1', 'a', 'a')));
    expect(error.message).toMatch(/V1 \(voltage-source\) has both pins on node "a"/);
  });

  it('accepts a voltage source in parallel with a capacitor, and an inductor feeding a resistor', () => {
    expect(() => checkTopology(circuit(V('V1', 'a', 'gnd'), C('C1', 'a', 'gnd'), L('L1', 'a', 'b'), R('R1', 'b', 'gnd')))).not.toThrow();
  });

  it('starts paths with the prefix it is given', () => {
    expect(topologyError(circuit(V('V1', 'a', 'gnd'), C('C1', 'a', 'b')), 'chain[1].circuit').where).toBe('chain[1].circuit.parts[1].pins[1]');
  });
});
