/**
 * Headroom: the sound level at the microphone at which the link starts to
 * fail, by criterion:
 *   - the LED first cuts off (a 1 kHz tone; any cut-off episode at all),
 *   - THD_F of the far end reaches 1 %, 3 %, 10 % (the same tone),
 *   - the LED first cuts off with speech (at its active speech level),
 *   - STOI of the far end against the clean speech drops below a threshold.
 * Each is a bracket-and-bisect search on the level in dB SPL (level-crossing.ts)
 * over short renders. Renders are cached by signal and level, so a level tried
 * by one search is reused by another, and the searches after the cut-off one
 * run side by side (on as many workers as the runner has).
 */
import { InputError } from '../errors.ts';
import { SPEECH_LEVEL_AT_ONE_METRE_DB_SPL, type VocalEffort } from '../link/acoustics/sound-level.ts';
import { targetLevelDbSpl, type Recording } from '../link/chain/source.ts';
import type { Scenario } from '../scenario/types.ts';
import { excerptOf } from '../worker/excerpt.ts';
import type { JobRunner, RenderJob } from '../worker/jobs.ts';
import { findCrossing, type CrossingResult } from './level-crossing.ts';
import type { MetricName } from './link-metrics.ts';

export interface HeadroomOptions {
  /** The answer is within ± this of the true crossing; default 0.25 dB. */
  toleranceDb: number;
  toneHertz: number;
  /** Length of each tone render; default 0.3 s. */
  toneSeconds: number;
  /** THD levels to find, percent; default 1, 3, 10. */
  thdPercents: number[];
  /** Run the speech searches (cut-off with speech, STOI). */
  speech: boolean;
  /** STOI below which speech counts as failing; null to skip the STOI search. */
  stoiThreshold: number | null;
  /** Length of each speech render (STOI needs about 0.4 s of active speech); default 1 s. */
  speechSeconds: number;
  /** Where the searches start; default the scenario's own level. */
  startDbSpl: number | null;
  minDbSpl: number;
  maxDbSpl: number;
}

export const HEADROOM_DEFAULTS: HeadroomOptions = {
  toleranceDb: 0.25,
  toneHertz: 1000,
  toneSeconds: 0.3,
  thdPercents: [1, 3, 10],
  speech: true,
  // Our choice for "clearly degraded" on STOI's 0–1 scale (common practice, no source).
  stoiThreshold: 0.8,
  speechSeconds: 1,
  startDbSpl: null,
  minDbSpl: 20,
  maxDbSpl: 150,
};

export type ProbeSignal = 'tone' | 'speech';

export interface Probe {
  signal: ProbeSignal;
  levelDbSpl: number;
  values: Record<string, number | null>;
  notes: string[];
}

export interface CriterionResult {
  key: string;
  label: string;
  signal: ProbeSignal;
  crossing: CrossingResult | { found: false; reason: 'failed'; message: string; evaluations: number };
  /** Talker distance giving the level found, per vocal effort (ANSI S3.5-1997 levels at 1 m, inverse-distance law). */
  talkerMetres: Record<VocalEffort, number> | null;
}

export interface HeadroomResult {
  startDbSpl: number;
  /** Cut-off level predicted from the first tone render (linear scaling of the LED swing). */
  cutoffEstimateDbSpl: number;
  speechSource: string;
  criteria: CriterionResult[];
  probes: Probe[];
}

const TONE_METRICS: MetricName[] = ['cutoffCount', 'cutoffFraction', 'minLedMilliamperes', 'restingLedMilliamperes', 'thdPercent', 'sinadDb', 'farEndDbv'];
const SPEECH_METRICS: MetricName[] = ['cutoffCount', 'cutoffFraction', 'minLedMilliamperes', 'stoi', 'snrDb', 'farEndDbv'];

export function checkHeadroomOptions(o: HeadroomOptions): void {
  const positive = (name: string, value: number, what: string) => {
    if (!(Number.isFinite(value) && value > 0)) throw new InputError(name, what, `got ${value}`);
  };
  positive('tolerance', o.toleranceDb, 'a tolerance above 0 dB');
  positive('toneSeconds', o.toneSeconds, 'a tone length above 0 s');
  positive('speechSeconds', o.speechSeconds, 'a speech length above 0 s');
  positive('toneHertz', o.toneHertz, 'a tone frequency above 0 Hz');
  for (const p of o.thdPercents) positive('thd', p, 'THD levels in percent above 0');
  if (o.stoiThreshold !== null && !(o.stoiThreshold > 0 && o.stoiThreshold < 1)) {
    throw new InputError('stoi threshold', 'a STOI value between 0 and 1', `got ${o.stoiThreshold}`);
  }
  if (!(o.minDbSpl < o.maxDbSpl)) throw new InputError('level range', 'a lowest level below the highest', `got ${o.minDbSpl} to ${o.maxDbSpl} dB SPL`);
}

/** Distance from the microphone at which a talker of each effort gives `levelDbSpl`. */
export function talkerDistances(levelDbSpl: number): Record<VocalEffort, number> {
  const out = {} as Record<VocalEffort, number>;
  for (const [effort, atOneMetre] of Object.entries(SPEECH_LEVEL_AT_ONE_METRE_DB_SPL)) {
    out[effort as VocalEffort] = 10 ** ((atOneMetre - levelDbSpl) / 20);
  }
  return out;
}

export async function findHeadroom(
  scenario: Scenario,
  recording: Recording | undefined,
  runner: JobRunner,
  options: HeadroomOptions,
  onProbe?: (probe: Probe, probesSoFar: number) => void,
): Promise<HeadroomResult> {
  checkHeadroomOptions(options);
  const speech = speechScenario(scenario, recording, options.speechSeconds);
  const cache = new Map<string, Promise<Probe>>();
  const probes: Probe[] = [];

  const probe = (signal: ProbeSignal, levelDbSpl: number): Promise<Probe> => {
    const key = `${signal}@${levelDbSpl}`;
    let pending = cache.get(key);
    if (!pending) {
      pending = runner.run(probeJob(signal, levelDbSpl)).then((result) => {
        const done: Probe = { signal, levelDbSpl, values: result.metrics.values, notes: result.metrics.notes };
        probes.push(done);
        onProbe?.(done, probes.length);
        return done;
      });
      cache.set(key, pending);
    }
    return pending;
  };

  function probeJob(signal: ProbeSignal, levelDbSpl: number): RenderJob {
    const level = { kind: 'spl' as const, dbSpl: levelDbSpl };
    if (signal === 'tone') {
      const source = { kind: 'tone' as const, frequencyHertz: options.toneHertz, seconds: options.toneSeconds, level };
      return { scenario: { ...scenario, source }, metrics: TONE_METRICS };
    }
    const excerpt = excerptOf({ ...speech.scenario, source: { ...speech.scenario.source, level } }, speech.recording, options.speechSeconds);
    const metrics = options.stoiThreshold === null ? SPEECH_METRICS.filter((m) => m !== 'stoi') : SPEECH_METRICS;
    return { scenario: excerpt.scenario, recording: excerpt.recording, metrics };
  }

  const clamp = (db: number) => Math.min(options.maxDbSpl, Math.max(options.minDbSpl, db));
  const startDbSpl = clamp(options.startDbSpl ?? targetLevelDbSpl(scenario.source.level));
  const first = await probe('tone', startDbSpl);
  const cutoffEstimateDbSpl = clamp(estimateCutoff(first, scenario.transmitter.cutoffAmperes));
  const search = { minDb: options.minDbSpl, maxDb: options.maxDbSpl, toleranceDb: options.toleranceDb };

  const criterion = async (
    key: string,
    label: string,
    signal: ProbeSignal,
    startDb: number,
    stepDb: number,
    holds: (p: Probe) => boolean,
  ): Promise<CriterionResult> => {
    let crossing: CriterionResult['crossing'];
    try {
      crossing = await findCrossing(async (db) => holds(await probe(signal, db)), { ...search, startDb, stepDb });
    } catch (error) {
      if (!(error instanceof Error) || (error.name !== 'InputError' && error.name !== 'ConvergenceError')) throw error;
      crossing = { found: false, reason: 'failed', message: error.message, evaluations: 0 };
    }
    return { key, label, signal, crossing, talkerMetres: crossing.found ? talkerDistances(crossing.levelDb) : null };
  };

  const cutoff = await criterion('cutoff', 'LED cut-off', 'tone', cutoffEstimateDbSpl, 1, (p) => (p.values.cutoffCount ?? 0) > 0);
  const anchor = cutoff.crossing.found ? cutoff.crossing.levelDb : startDbSpl;
  // A first guess for THD p %: below cut-off THD grows about in proportion to the amplitude when the
  // second harmonic dominates (a small-signal series, common practice, no source); only the start moves.
  const thdStart = (percent: number): [number, number] => {
    const thd0 = first.values.thdPercent;
    if ((first.values.cutoffCount ?? 1) > 0 || thd0 === null || !(thd0 > 0)) return [anchor, 2];
    return [clamp(first.levelDbSpl + 20 * Math.log10(percent / thd0)), 1];
  };
  const rest = await Promise.all([
    ...options.thdPercents.map((percent) =>
      criterion(`thd${percent}`, `THD ${percent} %`, 'tone', ...thdStart(percent), (p) => {
        const value = p.values.thdPercent;
        if (value === null) throw new InputError(`THD at ${p.levelDbSpl.toFixed(2)} dB SPL`, 'a measurable tone at the far end', p.notes.join('; '));
        return value >= percent;
      }),
    ),
    // Speech peaks stand well above its level, so speech cuts off below the tone's level: start lower.
    ...(options.speech ? [criterion('cutoffSpeech', 'LED cut-off, speech', 'speech', anchor - 10, 2, (p) => (p.values.cutoffCount ?? 0) > 0)] : []),
    ...(options.speech && options.stoiThreshold !== null
      ? [
          criterion('stoi', `STOI below ${options.stoiThreshold}`, 'speech', anchor, 3, (p) => {
            const value = p.values.stoi;
            if (value === null) throw new InputError(`STOI at ${p.levelDbSpl.toFixed(2)} dB SPL`, 'speech that STOI can measure', p.notes.join('; '));
            return value < (options.stoiThreshold as number);
          }),
        ]
      : []),
  ]);
  probes.sort((a, b) => (a.signal === b.signal ? a.levelDbSpl - b.levelDbSpl : a.signal < b.signal ? 1 : -1));
  return { startDbSpl, cutoffEstimateDbSpl, speechSource: speech.description, criteria: [cutoff, ...rest], probes };
}

/**
 * Level at which the LED swing would reach the cut-off current if the
 * transmitter were linear: the downward swing (rest − min) grows with the
 * pressure, so it reaches rest − threshold after 20·log10 of their ratio.
 */
function estimateCutoff(first: Probe, thresholdAmperes: number): number {
  const restMa = first.values.restingLedMilliamperes ?? 0;
  const minMa = first.values.minLedMilliamperes ?? restMa;
  const swing = restMa - minMa;
  const room = restMa - thresholdAmperes * 1000;
  if (!(swing > 1e-9 * Math.max(restMa, 1e-9)) || !(room > 0)) return first.levelDbSpl + 6;
  return first.levelDbSpl + 20 * Math.log10(room / swing);
}

/** The speech the STOI search uses: the scenario's own when it is speech, else our speech-like signal. */
function speechScenario(scenario: Scenario, recording: Recording | undefined, seconds: number): { scenario: Scenario; recording: Recording | undefined; description: string } {
  const source = scenario.source;
  if (source.kind === 'recording') return { scenario, recording, description: `the first ${seconds} s of ${recording?.label ?? source.file}` };
  if (source.kind === 'speech-like') return { scenario, recording, description: `the first ${seconds} s of the scenario's speech-like signal (seed ${source.seed})` };
  return {
    scenario: { ...scenario, source: { kind: 'speech-like', seconds, seed: 1, level: source.level } },
    recording: undefined,
    description: `${seconds} s of glowtalk's speech-like signal (seed 1), as the scenario's source is not speech`,
  };
}
