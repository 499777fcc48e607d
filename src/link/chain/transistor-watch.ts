import { Bjt } from '../../devices/bjt.ts';
import { voltageAt } from '../../devices/resistor.ts';
import type { Simulator } from '../../solver/simulator.ts';
import { IntervalTracker, toEpisodes, type Episodes } from './intervals.ts';

/** Saturation and cut-off episodes of one transistor of the link. */
export interface TransistorWatch {
  circuit: 'transmitter' | 'receiver';
  ref: string;
  /** Where its terminals sit in the solution (−1: ground). */
  collector: number;
  base: number;
  emitter: number;
  polarity: number;
  /** Junction voltage above which a junction counts as conducting (as `Bjt.region`). */
  conductingVolts: number;
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
    .map((device) => {
      const t = device.terminals;
      return {
        circuit,
        ref: device.ref,
        collector: t.collector,
        base: t.base,
        emitter: t.emitter,
        polarity: t.polarity,
        conductingVolts: device.conductingJunctionVolts,
        saturation: new IntervalTracker(samplePeriodSeconds, offsetSeconds),
        cutoff: new IntervalTracker(samplePeriodSeconds, offsetSeconds),
      };
    });
}

/**
 * Feeds sample `index`, the solution that starts at values[offset], to every watch: the same
 * classification as `Bjt.region`, written out because it runs for every transistor at every
 * internal sample (and reading the row in place: copying it cost more than the test).
 */
export function updateWatches(watches: readonly TransistorWatch[], index: number, values: Float64Array, offset: number): void {
  for (let k = 0; k < watches.length; k++) {
    const w = watches[k];
    const vb = voltageAt(values, w.base, offset);
    const ve = voltageAt(values, w.emitter, offset);
    const vc = voltageAt(values, w.collector, offset);
    const emitterOn = w.polarity * (vb - ve) > w.conductingVolts;
    const collectorOn = w.polarity * (vb - vc) > w.conductingVolts;
    w.saturation.update(index, emitterOn && collectorOn);
    w.cutoff.update(index, !emitterOn && !collectorOn);
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
