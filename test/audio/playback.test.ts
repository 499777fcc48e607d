import { describe, expect, it } from 'vitest';
import { OfflineAudioContext } from 'web-audio-api';
import { limitPeaks } from '../../src/audio/limiter.ts';
import { Player, SWITCH_CROSSFADE_SECONDS, toAudioBuffer } from '../../src/audio/playback.ts';
import { InputError } from '../../src/errors.ts';
import { SeededRandom } from '../../src/numeric/random.ts';

const RATE = 8000;
const fromDb = (db: number): number => 10 ** (db / 20);
const peakOf = (x: Float32Array): number => x.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
function sine(seconds: number, hertz: number, peak: number): Float32Array {
  return Float32Array.from({ length: Math.round(seconds * RATE) }, (_, n) => peak * Math.sin((2 * Math.PI * hertz * n) / RATE));
}
/** The real web-audio-api offline context, typed as the DOM interface the player is written against. */
function offline(seconds: number): { context: BaseAudioContext; render: () => Promise<Float32Array>; suspend: (t: number) => Promise<void>; resume: () => Promise<void> } {
  const real = new OfflineAudioContext(1, Math.round(seconds * RATE), RATE);
  return {
    context: real as unknown as BaseAudioContext,
    render: async () => (await real.startRendering()).getChannelData(0),
    suspend: (t) => real.suspend(t),
    resume: () => real.resume(),
  };
}

describe('limitPeaks', () => {
  it('never lets a sample exceed the ceiling, for loud noise and bursts at several settings', () => {
    const rng = new SeededRandom(3);
    const loud = Float32Array.from({ length: 3 * RATE }, (_, n) => (n % RATE < RATE / 3 ? 4 : 0.1) * rng.normal());
    for (const ceilingDb of [-6, -1, -20]) {
      for (const lookAheadSeconds of [0, 0.001, 0.005, 0.02]) {
        const { output, maxReductionDb } = limitPeaks(loud, RATE, { ceilingDb, lookAheadSeconds });
        expect(peakOf(output)).toBeLessThanOrEqual(fromDb(ceilingDb));
        expect(maxReductionDb).toBeGreaterThan(0);
      }
    }
  });

  it('passes a signal below the ceiling bit for bit', () => {
    const quiet = sine(1, 440, fromDb(-6.5));
    const { output, maxReductionDb, reducedSamples } = limitPeaks(quiet, RATE);
    expect(Array.from(output)).toEqual(Array.from(quiet));
    expect(maxReductionDb).toBe(0);
    expect(reducedSamples).toBe(0);
  });

  it('holds a steady loud tone at the ceiling with a constant gain', () => {
    // +6 dBFS peak into a −6 dB ceiling: 12.04 dB of reduction (20·log10(2/0.501)).
    const loud = sine(1, 500, 2);
    const { output, maxReductionDb } = limitPeaks(loud, RATE);
    expect(maxReductionDb).toBeCloseTo(6 + 20 * Math.log10(2), 3);
    const settled = output.subarray(RATE / 10);
    expect(20 * Math.log10(peakOf(settled))).toBeCloseTo(-6, 2);
    // Up to the last peak: after it the look-ahead sees nothing loud and the gain starts to recover.
    for (let i = RATE / 10; i < loud.length - 50; i++) if (Math.abs(loud[i]) > 0.5) expect(output[i] / loud[i]).toBeCloseTo(output[RATE / 10 + 4] / loud[RATE / 10 + 4], 6);
  });

  it('releases smoothly with the release time constant once a loud burst ends', () => {
    // 0.2 s at peak 2, then a quiet tone at 0.1: gain recovers as 1 − (1 − g0)·e^(−t/τ), τ = 0.1 s.
    const x = Float32Array.from({ length: RATE }, (_, n) => (n < 0.2 * RATE ? 2 : 0.1) * Math.sin((2 * Math.PI * 1000 * n) / RATE + 0.3));
    const { output } = limitPeaks(x, RATE, { releaseSeconds: 0.1, lookAheadSeconds: 0.005 });
    const g0 = fromDb(-6) / 2;
    const at = (seconds: number): number => {
      const n = Math.round(seconds * RATE);
      return output[n] / x[n];
    };
    // Hold ends when the burst leaves the look-ahead window; allow one window of timing slack.
    expect(at(0.2 + 0.1 + 0.005)).toBeGreaterThan(1 - (1 - g0) * Math.exp(-1) - 0.03);
    expect(at(0.2 + 0.1 + 0.005)).toBeLessThan(1 - (1 - g0) * Math.exp(-1) + 0.03);
    for (let n = 0.2 * RATE + 1; n < RATE - 1; n++) {
      if (Math.abs(x[n]) > 0.05 && Math.abs(x[n + 1]) > 0.05) expect(output[n + 1] / x[n + 1]).toBeGreaterThanOrEqual(output[n] / x[n] - 1e-9);
    }
  });

  it('rejects a ceiling above full scale and non-finite samples', () => {
    expect(() => limitPeaks(new Float32Array(4), RATE, { ceilingDb: 3 })).toThrow(InputError);
    expect(() => limitPeaks(new Float32Array([0, Number.POSITIVE_INFINITY]), RATE)).toThrow('samples[1]');
  });
});

describe('toAudioBuffer and Player on web-audio-api OfflineAudioContext', () => {
  const ramp = (seconds: number, offset = 0): Float64Array => Float64Array.from({ length: Math.round(seconds * RATE) }, (_, n) => offset + (0.4 * n) / (seconds * RATE));

  it('plays a buffer made 20 dB too loud without exceeding the −6 dBFS ceiling', async () => {
    const { context, render } = offline(1);
    const buffer = toAudioBuffer(context, Float64Array.from(sine(1, 300, 0.5)), RATE, 20);
    new Player(context).play(buffer);
    const out = await render();
    expect(peakOf(out)).toBeLessThanOrEqual(fromDb(-6));
    expect(peakOf(out)).toBeGreaterThan(fromDb(-6.1));
    expect(Array.from(out)).toEqual(Array.from(buffer.getChannelData(0)));
  });

  it('plays a quiet signal unchanged in level, sample for sample', async () => {
    const { context, render } = offline(1);
    const quiet = Float64Array.from(sine(1, 300, 0.2));
    new Player(context).play(toAudioBuffer(context, quiet, RATE, 0));
    const out = await render();
    expect(Array.from(out)).toEqual(Array.from(quiet, Math.fround));
  });

  it('starts at an offset and stops at a given time, reporting the position', async () => {
    const { context, render } = offline(1);
    const player = new Player(context);
    const a = toAudioBuffer(context, ramp(2), RATE, 0);
    player.play(a, { offsetSeconds: 0.5 });
    player.stop(0.75);
    expect(player.currentPositionSeconds()).toBeCloseTo(1.25, 12);
    const out = await render();
    const source = a.getChannelData(0);
    for (const n of [0, 100, 1999]) expect(out[n]).toBe(source[n + 4000]);
    expect(peakOf(out.subarray(0.75 * RATE))).toBe(0);
  });

  it('switches to another buffer at the same position without a gap', async () => {
    const { context, render } = offline(2);
    const a = toAudioBuffer(context, ramp(2), RATE, 0);
    const b = toAudioBuffer(context, ramp(2, 0.05), RATE, 0); // b = a + 0.05 at every position
    const player = new Player(context);
    player.play(a);
    player.switchTo(b, 1);
    const out = await render();
    const sa = a.getChannelData(0);
    const sb = b.getChannelData(0);
    const fadeEnd = RATE + SWITCH_CROSSFADE_SECONDS * RATE;
    for (let n = 0; n < 2 * RATE; n++) {
      if (n < RATE) expect(out[n]).toBe(sa[n]);
      else if (n >= fadeEnd) expect(out[n]).toBe(sb[n]);
      else {
        // Linear crossfade of the two at the same position: weight w = (n − switch) / fade.
        const w = (n - RATE) / (fadeEnd - RATE);
        expect(out[n]).toBeCloseTo((1 - w) * sa[n] + w * sb[n], 6);
      }
    }
  });

  it('switches while rendering is suspended, continuing from the position reached', async () => {
    const { context, render, suspend, resume } = offline(2);
    const a = toAudioBuffer(context, ramp(2), RATE, 0);
    const b = toAudioBuffer(context, ramp(2, 0.05), RATE, 0);
    const player = new Player(context);
    player.play(a, { offsetSeconds: 0.25 });
    const switched = suspend(1).then(() => {
      player.switchTo(b);
      return resume();
    });
    const out = await render();
    await switched;
    // web-audio-api suspends on a 128-frame render quantum: suspend(1) lands on frame 8064.
    const at = Math.ceil(RATE / 128) * 128;
    const sb = b.getChannelData(0);
    const fadeFrames = SWITCH_CROSSFADE_SECONDS * RATE;
    for (let n = at + fadeFrames; n < 2 * RATE - 0.25 * RATE; n++) expect(out[n]).toBe(sb[n + 0.25 * RATE]);
    const jump = Math.max(...Array.from(out.subarray(1, 2 * RATE - 0.25 * RATE), (v, i) => Math.abs(v - out[i])));
    expect(jump).toBeLessThan(0.05 / fadeFrames + 1e-4); // the 0.05 step is spread over the fade
  });

  it('loops a stretch of the buffer and reports the wrapped position', async () => {
    const { context, render } = offline(0.9);
    const a = toAudioBuffer(context, ramp(1), RATE, 0);
    const player = new Player(context);
    player.play(a, { loop: { startSeconds: 0.25, endSeconds: 0.5 } });
    const out = await render();
    const source = a.getChannelData(0);
    for (let n = 0; n < 0.9 * RATE; n++) {
      const position = n < 0.5 * RATE ? n : 0.25 * RATE + ((n - 0.5 * RATE) % (0.25 * RATE));
      expect(out[n]).toBe(source[position]);
    }
    // The offline clock stops at the end of the last 128-frame quantum (0.912 s here).
    expect(context.currentTime).toBeCloseTo(0.912, 12);
    expect(player.currentPositionSeconds()).toBeCloseTo(0.25 + (0.912 - 0.5 - 0.25), 9);
  });

  it('rejects an offset past the end and a loop outside the buffer', () => {
    const { context } = offline(1);
    const a = toAudioBuffer(context, ramp(1), RATE, 0);
    const player = new Player(context);
    expect(() => player.play(a, { offsetSeconds: 1 })).toThrow('offsetSeconds');
    expect(() => player.play(a, { loop: { startSeconds: 0.5, endSeconds: 1.5 } })).toThrow('loop');
    expect(() => toAudioBuffer(context, ramp(1), RATE, Number.NaN)).toThrow('gainDb');
  });
});
