/**
 * Figures of merit of one render of the link, by name, for sweeps, tolerance
 * runs and the headroom search. Each is a number or null (with a note) when
 * it does not apply to the source or cannot be measured; never NaN.
 *
 * Tone metrics (THD, SINAD) read the far end over its steady part: the first
 * 0.1 s (at most a third of the record) is skipped so coupling capacitors and
 * the tone's 10 ms fade-in are over, and the last 15 ms (the fade-out).
 * Speech metrics (STOI, segmental SNR) compare the far end with the clean
 * source pressure after time and least-squares level alignment; the SNR is
 * by coherence, so the link's own frequency response does not count as noise.
 */
import { InputError } from '../errors.ts';
import type { RenderResult } from '../link/chain/chain.ts';
import type { Scenario } from '../scenario/types.ts';
import { align } from './align.ts';
import { coherentSnr } from './coherent-snr.ts';
import { segmentalSnr } from './segmental-snr.ts';
import { stoiAligned } from './stoi.ts';
import { thdPlusNoise } from './thd-plus-noise.ts';
import { thd } from './thd.ts';

/** What a metric needs from the source: any signal, a single tone, or speech (a recording or speech-like). */
export type MetricSignal = 'any' | 'tone' | 'speech';
/** Which way a metric gets worse, for worst-case reports. */
export type WorseWhen = 'higher' | 'lower' | 'either';

export interface MetricInfo {
  unit: string;
  signal: MetricSignal;
  worse: WorseWhen;
  description: string;
}

export const LINK_METRICS = {
  restingLedMilliamperes: { unit: 'mA', signal: 'any', worse: 'either', description: 'LED current at rest (DC operating point)' },
  minLedMilliamperes: { unit: 'mA', signal: 'any', worse: 'lower', description: 'lowest LED current during the render' },
  cutoffFraction: { unit: '1', signal: 'any', worse: 'higher', description: 'fraction of the time the LED is below its cut-off current' },
  cutoffCount: { unit: '1', signal: 'any', worse: 'higher', description: 'number of LED cut-off episodes' },
  farEndDbv: { unit: 'dBV', signal: 'any', worse: 'either', description: 'far-end rms level across the speaker, dB re 1 V' },
  thdPercent: { unit: '%', signal: 'tone', worse: 'higher', description: 'THD_F of the far end (harmonics up to 20 kHz re the fundamental)' },
  sinadDb: { unit: 'dB', signal: 'tone', worse: 'lower', description: 'SINAD of the far end, 20 Hz–20 kHz (AES17-style, sine-fit notch)' },
  stoi: { unit: '1', signal: 'speech', worse: 'lower', description: 'STOI of the far end against the clean source (Taal et al. 2011), aligned' },
  snrDb: {
    unit: 'dB',
    signal: 'any',
    worse: 'lower',
    description: 'far-end power coherent with the source over the rest (noise and distortion), 20 Hz–20 kHz (coherent-snr.ts)',
  },
  segSnrDb: { unit: 'dB', signal: 'speech', worse: 'lower', description: 'segmental SNR over active 20 ms frames, aligned, clamped to [−10, 35] dB' },
} as const satisfies Record<string, MetricInfo>;

export type MetricName = keyof typeof LINK_METRICS;
export const METRIC_NAMES = Object.keys(LINK_METRICS) as MetricName[];

/** Metric values in the order asked for; null where not measured, with the reason in `notes`. */
export interface MetricValues {
  values: Record<string, number | null>;
  notes: string[];
}

/** The kind of signal the scenario's source is. */
export function sourceSignal(scenario: Scenario): 'tone' | 'speech' | 'other' {
  const kind = scenario.source.kind;
  if (kind === 'tone') return 'tone';
  if (kind === 'recording' || kind === 'speech-like') return 'speech';
  return 'other';
}

/** The metrics that suit a source when none are asked for. */
export function defaultMetrics(scenario: Scenario): MetricName[] {
  const common: MetricName[] = ['restingLedMilliamperes', 'minLedMilliamperes', 'cutoffFraction', 'farEndDbv'];
  const signal = sourceSignal(scenario);
  if (signal === 'tone') return [...common, 'thdPercent', 'sinadDb'];
  if (signal === 'speech') return [...common, 'stoi', 'snrDb'];
  return [...common, 'snrDb'];
}

/** Reads a comma-separated list of metric names; `where` names the flag or field. */
export function parseMetricList(text: string, where: string): MetricName[] {
  const names = text.split(',').map((s) => s.trim()).filter((s) => s !== '');
  if (names.length === 0) throw new InputError(where, `one or more of ${METRIC_NAMES.join(', ')}`, 'got none');
  for (const name of names) {
    if (!Object.hasOwn(LINK_METRICS, name)) throw new InputError(where, `metric names among ${METRIC_NAMES.join(', ')}`, `got "${name}"`);
  }
  return [...new Set(names)] as MetricName[];
}

/** Throws unless every metric suits the scenario's source. */
export function checkMetricsApply(metrics: readonly MetricName[], scenario: Scenario, where: string): void {
  const signal = sourceSignal(scenario);
  for (const name of metrics) {
    const needs = LINK_METRICS[name].signal;
    if (needs !== 'any' && needs !== signal) {
      throw new InputError(where, `metrics that suit a ${scenario.source.kind} source (${name} needs a ${needs} source)`, `got ${name}`);
    }
  }
}

/** Start and end (exclusive) of the steady part of a test-signal record. */
export function steadyWindow(length: number, rateHertz: number): { start: number; end: number } {
  const start = Math.round(Math.min(0.1, length / rateHertz / 3) * rateHertz);
  const end = Math.max(start + 2, length - Math.round(0.015 * rateHertz));
  return { start, end: Math.min(end, length) };
}

/** Measures the asked metrics on a render of `scenario`. */
export function measureRender(scenario: Scenario, result: RenderResult, metrics: readonly MetricName[]): MetricValues {
  const values: Record<string, number | null> = {};
  const notes: string[] = [];
  const fs = scenario.sampleRateHertz;
  const report = result.report;
  const far = result.farEndVolts;
  const source = result.sourcePascals;
  const steady = steadyWindow(far.length, fs);
  let aligned: Float64Array | undefined;
  const alignedFarEnd = (): Float64Array => {
    if (aligned === undefined) aligned = align(source, far, fs, { maxLagSeconds: 0.05 }).aligned;
    return aligned;
  };
  for (const name of metrics) {
    try {
      values[name] = measureOne(name);
    } catch (error) {
      if (!(error instanceof InputError)) throw error;
      values[name] = null;
      notes.push(`${name}: ${error.message}`);
    }
  }
  return { values, notes };

  function measureOne(name: MetricName): number | null {
    switch (name) {
      case 'restingLedMilliamperes':
        return report.led.restingAmperes * 1000;
      case 'minLedMilliamperes':
        return report.led.minimumAmperes * 1000;
      case 'cutoffFraction':
        return report.led.cutoff.fraction;
      case 'cutoffCount':
        return report.led.cutoff.count;
      case 'farEndDbv':
        return Math.max(-300, report.farEnd.rmsDbv);
      case 'thdPercent':
      case 'sinadDb': {
        if (scenario.source.kind !== 'tone') return notApplicable(name);
        const record = far.subarray(steady.start, steady.end);
        if (name === 'thdPercent') return 100 * thd(record, fs, { fundamentalHertz: scenario.source.frequencyHertz }).thdFundamental;
        return thdPlusNoise(record, fs, { fundamentalHertz: scenario.source.frequencyHertz }).sinadDb;
      }
      case 'stoi':
        if (sourceSignal(scenario) !== 'speech') return notApplicable(name);
        return stoiAligned(source, far, fs, { maxLagSeconds: 0.05 });
      case 'snrDb':
        return coherentSnr(source, far, fs).snrDb;
      case 'segSnrDb': {
        if (sourceSignal(scenario) !== 'speech') return notApplicable(name);
        return segmentalSnr(source, alignedFarEnd(), fs, { activeOnly: true }).segmentalSnrDb;
      }
    }
  }

  function notApplicable(name: MetricName): null {
    notes.push(`${name}: not measured for a ${scenario.source.kind} source`);
    return null;
  }
}
