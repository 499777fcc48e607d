import { parseCircuitText } from '../circuit/index.ts';
import { InputError } from '../errors.ts';
import { nodeNames, resolveProbe } from '../solver/probes.ts';
import { Simulator } from '../solver/simulator.ts';
import { runTransient } from '../solver/transient.ts';
import { parseEngineering } from '../units/engineering.ts';
import { AtomicFile, readFileText } from './files.ts';

export interface TransientFlags {
  stop: string;
  step: string;
  probe?: string[];
  csv?: string;
  method?: string;
  steps?: string;
}

/** Reads a time flag in seconds, engineering notation allowed ("10m", "5u"). */
export function secondsFlag(value: string | undefined, flag: string): number {
  if (value === undefined) throw new InputError(flag, 'a time in seconds, e.g. 10m or 0.01');
  try {
    const seconds = parseEngineering(value);
    if (seconds > 0 && Number.isFinite(seconds)) return seconds;
  } catch {
    /* reported below */
  }
  throw new InputError(flag, 'a positive time in seconds, e.g. 10m or 0.01', `got "${value}"`);
}

/** `glowtalk transient FILE`: a CSV of the probes over time. */
export function runTransientCommand(file: string, flags: TransientFlags, write: (text: string) => void): void {
  const circuit = parseCircuitText(readFileText(file, 'circuit'), file);
  const stopSeconds = secondsFlag(flags.stop, '--stop');
  const stepSeconds = secondsFlag(flags.step, '--step');
  const method = flags.method ?? 'tr';
  if (method !== 'tr' && method !== 'bdf2') throw new InputError('--method', '"tr" (trapezoidal) or "bdf2"', `got "${method}"`);
  const mode = flags.steps ?? 'adaptive';
  if (mode !== 'fixed' && mode !== 'adaptive') throw new InputError('--steps', '"fixed" or "adaptive"', `got "${mode}"`);
  const simulator = new Simulator(circuit, { method });
  const names = flags.probe && flags.probe.length > 0 ? flags.probe : nodeNames(simulator);
  const probes = names.map((name) => resolveProbe(simulator, name, '--probe'));
  const sink = flags.csv ? new AtomicFile(flags.csv, [file]) : null;
  const out = sink ? (text: string) => sink.write(text) : write;
  let buffer = `time,${names.map(csvField).join(',')}\n`;
  try {
    runTransient(simulator, { stopSeconds, stepSeconds, mode }, (seconds, x) => {
      buffer += String(seconds);
      for (const probe of probes) buffer += `,${probe(x)}`;
      buffer += '\n';
      if (buffer.length > 1 << 16) {
        out(buffer);
        buffer = '';
      }
    });
    out(buffer);
    sink?.commit();
  } catch (error) {
    sink?.abandon();
    throw error;
  }
}

function csvField(name: string): string {
  return /[",\n]/.test(name) ? `"${name.replace(/"/g, '""')}"` : name;
}
