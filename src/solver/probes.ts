import { InputError } from '../errors.ts';
import { Bjt } from '../devices/bjt.ts';
import type { Device, PinCurrents, TwoTerminal } from '../devices/device.ts';
import type { Simulator } from './simulator.ts';

/**
 * Reads one value from the simulator's current solution. A probe that also reads state
 * kept inside a device (a capacitance's current) is marked `readsDeviceState`: it must be
 * read right after its own step, not from a stored solution later.
 */
export type Probe = ((x: Float64Array) => number) & { readsDeviceState?: boolean };

const fromDevice = (probe: (x: Float64Array) => number): Probe => Object.assign(probe, { readsDeviceState: true });

const PIN_NAMES = ['collector', 'base', 'emitter'] as const satisfies readonly (keyof PinCurrents)[];

function isTwoTerminal(device: Device): device is TwoTerminal {
  return 'current' in device;
}

/**
 * Resolves a probe name: a node name gives its voltage (V); a part ref gives
 * its current (A, into pins[0] through the part); `REF.PIN` gives a
 * transistor's pin current (collector, base or emitter, capacitances included).
 */
export function resolveProbe(simulator: Simulator, name: string, where = 'probe'): Probe {
  const system = simulator.system;
  const node = system.nodeIndex(name);
  if (node !== undefined) return node < 0 ? () => 0 : (x) => x[node];
  const dot = name.lastIndexOf('.');
  if (dot > 0) {
    const device = system.devicesByRef.get(name.slice(0, dot));
    const pin = name.slice(dot + 1);
    if (device instanceof Bjt && (PIN_NAMES as readonly string[]).includes(pin)) {
      const key = pin as keyof PinCurrents;
      return fromDevice((x) => device.pinCurrents(x)[key]);
    }
    if (device instanceof Bjt) throw new InputError(where, `a pin of ${device.ref}: ${PIN_NAMES.join(', ')}`, `got "${pin}"`);
  }
  const device = system.devicesByRef.get(name);
  if (device instanceof Bjt) {
    throw new InputError(where, `a pin current such as ${name}.collector, ${name}.base or ${name}.emitter`, `"${name}" is a transistor`);
  }
  if (device && isTwoTerminal(device)) return fromDevice((x) => device.current(x));
  const nodes = nodeNames(simulator);
  throw new InputError(
    where,
    `a node (${['gnd', ...nodes].join(', ')}), a part ref (${[...system.devicesByRef.keys()].join(', ')}) or REF.PIN`,
    `no node or part named "${name}"`,
  );
}

/** The circuit's own node names (internal nodes left out). */
export function nodeNames(simulator: Simulator): string[] {
  const system = simulator.system;
  return system.unknownNames.slice(0, system.nodeCount).filter((n) => !n.includes('#'));
}

/** The probe names usable on this circuit (for help and for the page). */
export function probeNames(simulator: Simulator): string[] {
  const system = simulator.system;
  const names = nodeNames(simulator);
  for (const device of system.devices) {
    if (device instanceof Bjt) for (const pin of PIN_NAMES) names.push(`${device.ref}.${pin}`);
    else names.push(device.ref);
  }
  return names;
}
