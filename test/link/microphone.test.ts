import { describe, expect, it } from 'vitest';
import { Microphone, checkMicrophoneSettings, type MicrophoneSettings } from '../../src/link/microphone.ts';
import { dbSplToPascals } from '../../src/link/acoustics/sound-level.ts';
import { aWeightingGain } from '../../src/link/acoustics/a-weighting.ts';
import { InputError } from '../../src/errors.ts';
import { bandPower, rms } from './noise-spectrum.ts';

const base: MicrophoneSettings = {
  sensitivityDbvPerPascal: -44,
  outputResistanceOhms: 2200,
  selfNoiseDbaSpl: null,
  sampleRateHertz: 48000,
  seed: 7,
};

/** A 1 kHz tone of the given rms pressure, one second at 48 kHz (exactly 1000 cycles). */
function tone(rmsPascals: number): Float64Array {
  const x = new Float64Array(48000);
  for (let n = 0; n < x.length; n++) x[n] = Math.SQRT2 * rmsPascals * Math.sin((2 * Math.PI * 1000 * n) / 48000);
  return x;
}

/** Runs the block over `input` in chunks of `chunk` samples, reusing two buffers. */
function runChunked(mic: Microphone, input: Float64Array, chunk: number): Float64Array {
  const out = new Float64Array(input.length);
  const inBuf = new Float64Array(chunk);
  const outBuf = new Float64Array(chunk);
  for (let start = 0; start < input.length; start += chunk) {
    const n = Math.min(chunk, input.length - start);
    const i = n === chunk ? inBuf : new Float64Array(n);
    const o = n === chunk ? outBuf : new Float64Array(n);
    i.set(input.subarray(start, start + n));
    mic.process(i, o);
    out.set(o, start);
  }
  return out;
}

describe('microphone', () => {
  // IEC 60268-4: sensitivity is referred to 1 Pa (≈ 94 dB SPL) at 1 kHz; −44 dBV/Pa = 10^(−44/20) V = 6.3096 mV.
  it('turns a 1 kHz tone of 1 Pa rms into 6.3096 mV rms at −44 dBV/Pa', () => {
    const volts = runChunked(new Microphone(base), tone(1), 480);
    expect(Math.abs(rms(volts) / 6.3096e-3 - 1)).toBeLessThan(1e-4);
  });

  // Same reference; 94.000 dB SPL is 1.0023745 Pa (Lp = 20·log10(p/20 µPa)), so the output is 0.237 % higher.
  it('turns a 1 kHz tone at exactly 94 dB SPL into 6.3246 mV rms at −44 dBV/Pa', () => {
    const volts = runChunked(new Microphone(base), tone(dbSplToPascals(94)), 480);
    expect(Math.abs(rms(volts) / (6.30957344e-3 * 1.00237447) - 1)).toBeLessThan(1e-6);
  });

  // With a realistic self-noise of 30 dB(A) the tone at 1 Pa still reads 6.3096 mV within 1e-4 (noise is ~64 dB down).
  it('keeps the 1 Pa tone at 6.3096 mV rms within 1e-4 with 30 dB(A) self-noise switched on', () => {
    const volts = runChunked(new Microphone({ ...base, selfNoiseDbaSpl: 30 }), tone(1), 480);
    expect(Math.abs(rms(volts) / 6.3096e-3 - 1)).toBeLessThan(1e-4);
  });

  // Definition of the equivalent input noise: the A-weighted (IEC 61672-1) level of the noise over 20 Hz–20 kHz,
  // referred to the input through the sensitivity, equals the stated dB(A) SPL.
  it('produces self-noise whose A-weighted level over 20 Hz–20 kHz equals the stated 40 dB(A) SPL within 0.15 dB', () => {
    const mic = new Microphone({ ...base, selfNoiseDbaSpl: 40 });
    const silence = new Float64Array(1 << 17);
    const volts = new Float64Array(silence.length);
    mic.process(silence, volts);
    const weightedVoltsSquared = bandPower(volts, 48000, 20, 20000, aWeightingGain);
    const pascals = Math.sqrt(weightedVoltsSquared) / mic.sensitivityVoltsPerPascal;
    const levelDbA = 20 * Math.log10(pascals / 20e-6);
    expect(Math.abs(levelDbA - 40)).toBeLessThan(0.15);
  });

  it('gives the same noise for the same seed, different noise for another seed, and the same after reset', () => {
    const silence = new Float64Array(1000);
    const run = (seed: number): Float64Array => {
      const out = new Float64Array(1000);
      new Microphone({ ...base, selfNoiseDbaSpl: 35, seed }).process(silence, out);
      return out;
    };
    expect(run(1)).toEqual(run(1));
    expect(run(1)).not.toEqual(run(2));
    const mic = new Microphone({ ...base, selfNoiseDbaSpl: 35, seed: 1 });
    const first = new Float64Array(1000);
    mic.process(silence, first);
    mic.reset();
    const again = new Float64Array(1000);
    mic.process(silence, again);
    expect(again).toEqual(first);
  });

  it('gives bit-identical output whether a signal arrives in one chunk or many', () => {
    const input = tone(0.2);
    const settings = { ...base, selfNoiseDbaSpl: 32 };
    const whole = runChunked(new Microphone(settings), input, input.length);
    const pieces = runChunked(new Microphone(settings), input, 333);
    expect(pieces).toEqual(whole);
  });

  it('reports its output resistance for the circuit to put in series', () => {
    expect(new Microphone(base).outputResistanceOhms).toBe(2200);
  });

  it('refuses settings out of range with the field named', () => {
    expect(() => checkMicrophoneSettings({ ...base, sensitivityDbvPerPascal: 'loud' })).toThrow(InputError);
    expect(() => checkMicrophoneSettings({ ...base, sensitivityDbvPerPascal: 40 })).toThrow(
      /microphone\.sensitivityDbvPerPascal: got 40; expected a sensitivity from −100 to \+20 dBV\/Pa/,
    );
    expect(() => checkMicrophoneSettings({ ...base, outputResistanceOhms: -1 })).toThrow(/microphone\.outputResistanceOhms: got -1/);
    expect(() => checkMicrophoneSettings({ ...base, sampleRateHertz: 0 })).toThrow(/microphone\.sampleRateHertz/);
    expect(() => checkMicrophoneSettings({ ...base, seed: 1.5 })).toThrow(/microphone\.seed: got 1.5/);
    expect(() => checkMicrophoneSettings({ ...base, selfNoiseDbaSpl: undefined })).toThrow(/microphone\.selfNoiseDbaSpl: got nothing/);
    expect(() => checkMicrophoneSettings(null, 'scenario.microphone')).toThrow(/scenario\.microphone: got null; expected an object/);
  });
});
