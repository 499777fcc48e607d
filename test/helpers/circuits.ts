/**
 * Test-only helpers: build circuit files as plain objects and run them through
 * the real parser, or build a Circuit directly (to get past the parser's
 * checks on purpose), and collect probe values from a transient.
 */
import { parseCircuit } from '../../src/circuit/index.ts';
import type { Circuit } from '../../src/circuit/types.ts';
import { resolveProbe } from '../../src/solver/probes.ts';
import { Simulator, type SimulatorOptions } from '../../src/solver/simulator.ts';
import { runTransient, type TransientRequest } from '../../src/solver/transient.ts';
import { ZERO_CELSIUS_KELVIN } from '../../src/units/constants.ts';

export type PartEntry = Record<string, unknown> & { ref: string; kind: string; pins: string[] };

/** A glowtalk.circuit/1 file object. */
export function circuitFile(parts: PartEntry[], extra: Record<string, unknown> = {}): Record<string, unknown> {
  return { format: 'glowtalk.circuit/1', ...extra, parts };
}

/** Parses a circuit file object with the real parser (all checks apply). */
export function circuitOf(parts: PartEntry[], extra: Record<string, unknown> = {}): Circuit {
  return parseCircuit(circuitFile(parts, extra));
}

/** The Celsius temperature whose kelvin value the engine will compute as `kelvin`. */
export function celsiusFor(kelvin: number): number {
  return kelvin - ZERO_CELSIUS_KELVIN;
}

/** Probe values at every output point of a transient (t = 0 included). */
export interface Trace {
  seconds: number[];
  values: Record<string, number[]>;
}

export function transientTrace(
  circuit: Circuit,
  request: TransientRequest,
  probes: string[],
  options: SimulatorOptions = {},
): Trace {
  const simulator = new Simulator(circuit, options);
  const readers = probes.map((name) => resolveProbe(simulator, name));
  const trace: Trace = { seconds: [], values: Object.fromEntries(probes.map((p) => [p, [] as number[]])) };
  runTransient(simulator, request, (seconds, x) => {
    trace.seconds.push(seconds);
    readers.forEach((read, i) => trace.values[probes[i]].push(read(x)));
  });
  return trace;
}
