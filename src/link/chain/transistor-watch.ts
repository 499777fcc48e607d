import { Bjt, REGION_CUTOFF, REGION_SATURATION } from '../../devices/bjt.ts';
import type { Simulator } from '../../solver/simulator.ts';
import { IntervalTracker, toEpisodes, type Episodes } from './intervals.ts';

/** Saturation and cut-off episodes of one transistor of the link. */
export interface TransistorWatch {
  circuit: 'transmitter' | 'receiver';
  ref: string;
  device: Bjt;
  saturation: IntervalTracker;
  cutoff: IntervalTracker;
}

/** A watch on every transistor of a circuit; times in source seconds (see IntervalTracker). */
export function watchTransistors(
  circuit: TransistorWatch['circuit'],
  simulator: Simulator,
  samplePeriodSeconds: number,
  offsetSeconds: number,
): TransistorWatch[] {
  return simulator.system.devices
    .filter((device): device is Bjt => device instanceof Bjt)
    .map((device) => ({
      circuit,
      ref: device.ref,
      device,
      saturation: new IntervalTracker(samplePeriodSeconds, offsetSeconds),
      cutoff: new IntervalTracker(samplePeriodSeconds, offsetSeconds),
    }));
}

/** Feeds sample `index` of solution x to every watch. */
export function updateWatches(watches: readonly TransistorWatch[], index: number, x: Float64Array): void {
  for (const w of watches) {
    const region = w.device.regionCode(x);
    w.saturation.update(index, region === REGION_SATURATION);
    w.cutoff.update(index, region === REGION_CUTOFF);
  }
}

/** A transistor's episodes as plain data for the report. */
export interface TransistorEpisodes {
  circuit: TransistorWatch['circuit'];
  ref: string;
  saturation: Episodes;
  cutoff: Episodes;
}

/** Ends every open episode and returns the findings. */
export function finishWatches(watches: readonly TransistorWatch[]): TransistorEpisodes[] {
  return watches.map((w) => {
    w.saturation.finish();
    w.cutoff.finish();
    return { circuit: w.circuit, ref: w.ref, saturation: toEpisodes(w.saturation), cutoff: toEpisodes(w.cutoff) };
  });
}
