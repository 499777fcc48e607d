import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.ts';
import { calibratedSource } from '../../src/link/chain/source.ts';
import { loadScenario } from '../../src/scenario/index.ts';
import { displaySpectrum } from '../../src/worker/display-spectrum.ts';
import { excerptOf } from '../../src/worker/excerpt.ts';
import { transferables, type BiasTables, type RenderRequest } from '../../src/worker/messages.ts';
import { runRenderJob } from '../../src/worker/render-job.ts';

const starter = JSON.parse(readFileSync(new URL('../../components/scenarios/bench-starter.json', import.meta.url), 'utf8')) as Record<string, unknown>;
const noFiles = { readText: (): string => { throw new Error('no files'); } };

function request(scenario: unknown, excerptSeconds: number | null): RenderRequest {
  return { kind: 'render', id: 1, scenario, files: {}, label: 'starter', recording: null, excerptSeconds };
}

describe('the render job', () => {
  it('renders the first seconds of the source, reports the bias first, and gives finite figures or a reason', () => {
    let bias: BiasTables | null = null;
    let progressBeforeBias = false;
    const result = runRenderJob(request(starter, 0.25), {
      onBias: (b) => (bias = b),
      onProgress: () => {
        if (!bias) progressBeforeBias = true;
      },
    });
    expect(progressBeforeBias).toBe(false);
    expect(result.renderedSeconds).toBe(0.25);
    expect(result.fullSeconds).toBe(2);
    expect(result.sourcePascals.length).toBe(12000);
    expect(result.farEndVolts.length).toBe(12000);
    // The bias table and the chain start from the same operating point.
    expect(bias!.ledRestingAmperes).toBeCloseTo(result.report.led.restingAmperes, 12);
    expect(bias!.transmitter.parts.LED1).toBeDefined();
    expect(bias!.addedParts).toContain('VMIC#rout');
    // The report states the scenario's level (84 dB SPL rms), not the excerpt's stand-in.
    expect(result.report.microphone.targetDbSpl).toBe(84);
    expect(result.report.microphone.levelMeasure).toBe('rms');
    for (const metric of result.metrics) {
      if (metric.value === null) expect(metric.note ?? '').not.toBe('');
      else expect(Number.isFinite(metric.value)).toBe(true);
    }
    expect(result.taps.map((t) => t.name)).toEqual(expect.arrayContaining(['microphone.volts', 'transmitter.led', 'light.detectorWatts', 'transmitter.QDRV.collector']));
    // Every big buffer is transferred, each once.
    const buffers = transferables(result);
    expect(new Set(buffers).size).toBe(buffers.length);
    expect(buffers).toContain(result.farEndVolts.buffer);
    for (const tap of result.taps) expect(buffers).toContain(tap.samples.buffer);
  });

  it('fails on a bad value with the JSON path of the field, before any bias or render', () => {
    const bad = { ...starter, microphone: { ...(starter.microphone as object), sensitivity: 500 } };
    let biasSeen = false;
    const attempt = () => runRenderJob(request(bad, 0.1), { onBias: () => (biasSeen = true) });
    expect(attempt).toThrow(InputError);
    expect(attempt).toThrow(/microphone\.sensitivity/);
    expect(biasSeen).toBe(false);
  });
});

describe('an excerpt of the source', () => {
  const scenario = loadScenario(starter, noFiles, 'starter');

  it('is the first samples of the fully calibrated source, to rounding', () => {
    const full = calibratedSource(scenario.source, 48000);
    const cut = excerptOf(scenario, undefined, 0.1);
    expect(cut.renderedSeconds).toBe(0.1);
    expect(cut.fullSeconds).toBe(2);
    const again = calibratedSource(cut.scenario.source, 48000, cut.recording);
    expect(again.pascals.length).toBe(4800);
    let worst = 0;
    for (let i = 0; i < 4800; i++) worst = Math.max(worst, Math.abs(again.pascals[i] - full.pascals[i]));
    let peak = 0;
    for (let i = 0; i < 4800; i++) peak = Math.max(peak, Math.abs(full.pascals[i]));
    expect(worst / peak).toBeLessThan(1e-12);
  });

  it('is the whole source when the source is shorter than asked, and unchanged', () => {
    const cut = excerptOf(scenario, undefined, 5);
    expect(cut.scenario).toBe(scenario);
    expect(cut.renderedSeconds).toBe(2);
  });

  it('of silence is refused with a reason', () => {
    const silent = { ...scenario, source: { kind: 'recording' as const, file: 'quiet.wav', level: { kind: 'spl' as const, dbSpl: 70 } } };
    const samples = new Float64Array(48000);
    for (let i = 24000; i < 48000; i++) samples[i] = Math.sin(i / 7);
    expect(() => excerptOf(silent, { samples, sampleRateHertz: 48000, label: 'quiet.wav' }, 0.2)).toThrow(/first 0.2 s are silent/);
  });
});

describe('a display spectrum', () => {
  it('of a sine peaks in the band holding its frequency, within the Hann window main-lobe loss of 0 dBr', () => {
    // A Hann-windowed tone on a bin puts bins −1, 0, +1 at amplitudes ½, 1, ½ (F. J. Harris, Proc. IEEE 66(1), 1978,
    // Table 1): the centre bin holds 1/1.5 of the power, −1.76 dB; off a bin it holds less, down to about −3 dB.
    const rate = 48000;
    const x = new Float64Array(rate);
    for (let i = 0; i < x.length; i++) x[i] = Math.sin((2 * Math.PI * 1000 * i) / rate);
    const s = displaySpectrum('tone', x, rate);
    let best = 0;
    for (let b = 1; b < s.levelDb.length; b++) if (s.levelDb[b] > s.levelDb[best]) best = b;
    expect(Math.abs(Math.log2(s.hertz[best] / 1000))).toBeLessThan(1 / 24);
    expect(s.levelDb[best]).toBeGreaterThan(-3.1);
    expect(s.levelDb[best]).toBeLessThan(-1.7);
    // Far from the tone the Hann sidelobes have fallen below −100 dB.
    const far = s.hertz.findIndex((f) => f > 8000);
    expect(s.levelDb[far]).toBeLessThan(-100);
    for (const level of s.levelDb) expect(Number.isFinite(level)).toBe(true);
  });
});
