import type { Circuit } from '../circuit/types.ts';
import { Bjt } from '../devices/bjt.ts';
import type { TwoTerminal } from '../devices/device.ts';
import { voltageAt } from '../devices/resistor.ts';
import type { OperatingPointMethod } from './operating-point.ts';
import { Simulator, type SimulatorOptions } from './simulator.ts';

export type PartBias =
  | { voltage: number; current: number }
  | { currents: { collector: number; base: number; emitter: number }; region: 'active' | 'saturation' | 'cutoff' | 'reverse' };

export interface BiasReport {
  nodes: Record<string, number>;
  parts: Record<string, PartBias>;
  /** How the operating point was reached. */
  method: OperatingPointMethod;
}

/** The DC operating point of a circuit, in the shape `glowtalk bias` prints. */
export function biasPoint(circuit: Circuit, options: SimulatorOptions = {}): BiasReport {
  const simulator = new Simulator(circuit, options);
  const method = simulator.operatingPoint();
  return describeBias(simulator, method);
}

export function describeBias(simulator: Simulator, method: OperatingPointMethod): BiasReport {
  const { system, x } = simulator;
  const nodes: Record<string, number> = {};
  for (let i = 0; i < system.nodeCount; i++) {
    const name = system.unknownNames[i];
    if (!name.includes('#')) nodes[name] = x[i];
  }
  const parts: Record<string, PartBias> = {};
  system.circuit.parts.forEach((part, index) => {
    const device = system.devices[index];
    if (device instanceof Bjt) {
      parts[part.ref] = { currents: device.pinCurrents(x), region: device.region(x) };
    } else {
      const a = system.nodeIndex(part.pins[0]) ?? -1;
      const b = system.nodeIndex(part.pins[1]) ?? -1;
      parts[part.ref] = { voltage: voltageAt(x, a) - voltageAt(x, b), current: (device as TwoTerminal).current(x) };
    }
  });
  return { nodes, parts, method };
}
