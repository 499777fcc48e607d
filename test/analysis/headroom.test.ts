import { describe, expect, it } from 'vitest';
import { findHeadroom, HEADROOM_DEFAULTS, talkerDistances } from '../../src/analysis/headroom.ts';
import { thd } from '../../src/analysis/thd.ts';
import { steadyWindow } from '../../src/analysis/link-metrics.ts';
import { renderScenario } from '../../src/link/chain/chain.ts';
import type { Scenario } from '../../src/scenario/types.ts';
import { inProcessRunner } from '../../src/worker/jobs.ts';
import { linkScenario } from './link-fixture.ts';

const TONE_SECONDS = 0.1;

function toneAt(scenario: Scenario, dbSpl: number): Scenario {
  return { ...scenario, source: { kind: 'tone', frequencyHertz: 1000, seconds: TONE_SECONDS, level: { kind: 'spl', dbSpl } } };
}

describe('findHeadroom', () => {
  it('puts the LED cut-off and the 3 % THD level within ±tolerance of what direct renders show', async () => {
    const scenario = linkScenario();
    const tolerance = 0.25;
    const result = await findHeadroom(scenario, undefined, inProcessRunner(), {
      ...HEADROOM_DEFAULTS,
      toleranceDb: tolerance,
      toneSeconds: TONE_SECONDS,
      thdPercents: [3],
      speech: false,
    });
    const [cutoff, thd3] = result.criteria;
    if (!cutoff.crossing.found || !thd3.crossing.found) throw new Error('a level was not found');

    // The definition of the answer: no cut-off episode at L − tol, at least one at L + tol.
    const below = renderScenario(toneAt(scenario, cutoff.crossing.levelDb - tolerance)).report.led.cutoff.count;
    const above = renderScenario(toneAt(scenario, cutoff.crossing.levelDb + tolerance)).report.led.cutoff.count;
    expect(below).toBe(0);
    expect(above).toBeGreaterThan(0);

    // THD_F (IEC 60050 IEV 551-20-13) of the far end read by the colleague's thd(), over the same steady stretch.
    const thdAt = (db: number) => {
      const far = renderScenario(toneAt(scenario, db)).farEndVolts;
      const w = steadyWindow(far.length, 48000);
      return 100 * thd(far.subarray(w.start, w.end), 48000, { fundamentalHertz: 1000 }).thdFundamental;
    };
    expect(thdAt(thd3.crossing.levelDb - tolerance)).toBeLessThan(3);
    expect(thdAt(thd3.crossing.levelDb + tolerance)).toBeGreaterThanOrEqual(3);
    // Distortion comes before cut-off in this link, and every probe is listed once.
    expect(thd3.crossing.levelDb).toBeLessThan(cutoff.crossing.levelDb);
    const keys = result.probes.map((p) => `${p.signal}@${p.levelDbSpl}`);
    expect(new Set(keys).size).toBe(keys.length);
  });

  it('finds where speech first cuts the LED off within ±tolerance, below the tone\'s cut-off level (speech peaks stand above its level)', async () => {
    const scenario = linkScenario();
    const tolerance = 0.25;
    const result = await findHeadroom(scenario, undefined, inProcessRunner(), {
      ...HEADROOM_DEFAULTS,
      toneSeconds: TONE_SECONDS,
      thdPercents: [],
      stoiThreshold: null,
      speechSeconds: 0.3,
    });
    const [tone, speech] = result.criteria;
    expect(speech.key).toBe('cutoffSpeech');
    if (!tone.crossing.found || !speech.crossing.found) throw new Error('a level was not found');
    // The speech the search used: glowtalk's speech-like signal, seed 1, at its active speech level (ITU-T P.56).
    const speechAt = (dbSpl: number): Scenario => ({ ...scenario, source: { kind: 'speech-like', seconds: 0.3, seed: 1, level: { kind: 'spl', dbSpl } } });
    expect(renderScenario(speechAt(speech.crossing.levelDb - tolerance)).report.led.cutoff.count).toBe(0);
    expect(renderScenario(speechAt(speech.crossing.levelDb + tolerance)).report.led.cutoff.count).toBeGreaterThan(0);
    expect(speech.crossing.levelDb).toBeLessThan(tone.crossing.levelDb);
  });

  it('turns a level into talker distances by the ANSI S3.5-1997 speech levels at 1 m and the inverse-distance law', () => {
    // ANSI S3.5-1997 Table 3: normal 62.35 dB SPL at 1 m; at 2 m 62.35 − 20·log10(2) = 56.3294 dB SPL.
    const d = talkerDistances(62.35 - 20 * Math.log10(2));
    expect(d.normal).toBeCloseTo(2, 12);
    // Shout is 82.30 dB at 1 m: 19.95 dB louder, so 10^(19.95/20) times as far.
    expect(d.shout / d.normal).toBeCloseTo(10 ** (19.95 / 20), 9);
  });
});
