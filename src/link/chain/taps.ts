import { InputError } from '../../errors.ts';
import { resolveProbe, type Probe } from '../../solver/probes.ts';
import type { Simulator } from '../../solver/simulator.ts';

/** A captured signal. */
export interface TapRecord {
  name: string;
  unit: 'V' | 'A' | 'W' | 'Pa';
  sampleRateHertz: number;
  samples: Float32Array;
}

/** Where a tap reads from. */
export type TapSource =
  | { stage: 'source' | 'microphone' | 'speaker' | 'emitter' | 'detector' }
  /** The signal LED's junction current (the transmitter works it out for the light anyway). */
  | { stage: 'led' }
  | { stage: 'transmitter' | 'receiver'; probe: Probe };

/** Named taps outside the circuits. */
const FIXED_TAPS: Record<string, { stage: 'source' | 'microphone' | 'speaker' | 'emitter' | 'detector'; unit: TapRecord['unit'] }> = {
  'source.pascals': { stage: 'source', unit: 'Pa' },
  'microphone.volts': { stage: 'microphone', unit: 'V' },
  'light.emitterWatts': { stage: 'emitter', unit: 'W' },
  'light.detectorWatts': { stage: 'detector', unit: 'W' },
  'speaker.volts': { stage: 'speaker', unit: 'V' },
};

export const FIXED_TAP_NAMES = Object.keys(FIXED_TAPS);

/** Grows in chunks of Float32 so a long capture does not reallocate per sample. */
export class TapCapture {
  private readonly chunks: Float32Array[] = [];
  private current: Float32Array = new Float32Array(65536);
  private used = 0;
  /** Samples to drop at the start (filter latency). */
  private skip: number;

  /** Samples still to take (the rest of the run is past the end of the source). */
  private remaining: number;

  constructor(
    readonly name: string,
    readonly unit: TapRecord['unit'],
    readonly sampleRateHertz: number,
    readonly source: TapSource,
    skipSamples: number,
    maxSamples: number,
    /** When given, full blocks go here instead of being kept (memory stays flat). */
    private readonly sink?: (name: string, block: Float32Array) => void,
  ) {
    this.skip = skipSamples;
    this.remaining = maxSamples;
  }

  push(value: number): void {
    if (this.skip > 0) {
      this.skip--;
      return;
    }
    if (this.remaining === 0) return;
    this.remaining--;
    if (this.used === this.current.length) {
      if (this.sink) this.sink(this.name, this.current);
      else this.chunks.push(this.current);
      this.current = new Float32Array(65536);
      this.used = 0;
    }
    this.current[this.used++] = value;
  }

  /** The captured record; with a sink, the last block goes to the sink and the record is empty. */
  finish(): TapRecord {
    if (this.sink) {
      if (this.used > 0) this.sink(this.name, this.current.subarray(0, this.used));
      this.used = 0;
      return { name: this.name, unit: this.unit, sampleRateHertz: this.sampleRateHertz, samples: new Float32Array(0) };
    }
    const total = this.chunks.length * 65536 + this.used;
    const samples = new Float32Array(total);
    let at = 0;
    for (const chunk of [...this.chunks, this.current.subarray(0, this.used)]) {
      const take = Math.min(chunk.length, total - at);
      samples.set(chunk.subarray(0, take), at);
      at += take;
      if (at >= total) break;
    }
    return { name: this.name, unit: this.unit, sampleRateHertz: this.sampleRateHertz, samples };
  }
}

/**
 * Resolves a tap name: `source.pascals`, `microphone.volts`, `light.emitterWatts`,
 * `light.detectorWatts`, `speaker.volts`, or `transmitter.X` / `receiver.X` with X a
 * node, a part ref or REF.PIN of that circuit (`transmitter.led` is the signal LED's junction
 * current, the one that makes light).
 */
export function resolveTap(
  name: string,
  where: string,
  circuits: { transmitter?: Simulator; receiver?: Simulator },
): { source: TapSource; unit: TapRecord['unit']; internalRate: boolean } {
  const fixed = FIXED_TAPS[name];
  if (fixed) return { source: { stage: fixed.stage }, unit: fixed.unit, internalRate: fixed.stage === 'emitter' || fixed.stage === 'detector' };
  const dot = name.indexOf('.');
  const stage = name.slice(0, dot);
  if (dot > 0 && (stage === 'transmitter' || stage === 'receiver')) {
    const inner = name.slice(dot + 1);
    const simulator = circuits[stage];
    if (!simulator) throw new Error(`tap ${name} resolved on the wrong side of the link`);
    // The junction current, which makes the light (the LED part's own current adds its capacitance's).
    if (stage === 'transmitter' && inner === 'led') return { source: { stage: 'led' }, unit: 'A', internalRate: true };
    const probe = resolveProbe(simulator, inner, where);
    const isNode = simulator.system.nodeIndex(inner) !== undefined;
    return { source: { stage, probe }, unit: isNode ? 'V' : 'A', internalRate: true };
  }
  throw new InputError(where, `a tap name: ${FIXED_TAP_NAMES.join(', ')}, or transmitter.X / receiver.X (X a node, part ref or REF.PIN)`, `got "${name}"`);
}

/** Where a stage's taps sit in time: rates, the upsampler's delay, the source's length. */
export interface TapTiming {
  sampleRateHertz: number;
  factor: number;
  /** The upsampler's latency in internal samples (dropped from internal-rate taps). */
  upLatencyInternal: number;
  /** Source samples at the audio rate. */
  totalSamples: number;
}

/** Captures for one stage's taps, each at the audio rate or the internal rate as the tap asks. */
export function captureTaps(
  names: readonly string[],
  circuits: { transmitter?: Simulator; receiver?: Simulator },
  timing: TapTiming,
  sink?: (name: string, block: Float32Array) => void,
): TapCapture[] {
  return names.map((name) => {
    const tap = resolveTap(name, `taps: ${name}`, circuits);
    return new TapCapture(
      name,
      tap.unit,
      tap.internalRate ? timing.sampleRateHertz * timing.factor : timing.sampleRateHertz,
      tap.source,
      tap.internalRate ? timing.upLatencyInternal : 0,
      tap.internalRate ? timing.totalSamples * timing.factor : timing.totalSamples,
      sink,
    );
  });
}

/** Some tap reads a device's own state: the circuit must then step one sample at a time (see probes.ts). */
export function readsDeviceState(taps: readonly TapCapture[]): boolean {
  return taps.some((t) => 'probe' in t.source && t.source.probe.readsDeviceState === true);
}

/** Which side of the link a tap belongs to (the receiver side: `receiver.X` and `speaker.volts`). */
export function isReceiverTap(name: string): boolean {
  return name.startsWith('receiver.') || name === 'speaker.volts';
}
