import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { bytesReader } from '../../../src/audio/byte-reader.ts';
import { resample } from '../../../src/audio/resample.ts';
import { WavFrameReader } from '../../../src/audio/wav-frame-reader.ts';
import { decodeWav } from '../../../src/audio/wav-read.ts';
import { encodeWav } from '../../../src/audio/wav-write.ts';
import { InputError } from '../../../src/errors.ts';
import { renderScenario } from '../../../src/link/chain/chain.ts';
import { calibratedSource } from '../../../src/link/chain/source.ts';
import { calibrateRecording, openSource } from '../../../src/link/chain/source-stream.ts';
import { SeededRandom } from '../../../src/numeric/random.ts';
import type { SourceSettings } from '../../../src/scenario/types.ts';
import { linkScenario } from '../../analysis/link-fixture.ts';

const speechBytes = new Uint8Array(readFileSync(new URL('../../../samples/speech/bay-talkback.wav', import.meta.url)));
const speech = decodeWav(speechBytes, 'bay-talkback.wav');
/** 0.35 s of the speech (past its leading silence) at 44.1 kHz as a float32 WAV, so the stream resamples. */
const clip44 = encodeWav(resample(speech.mono.slice(24000, 24000 + 16800), 48000, 44100), 44100, 'float32').bytes;
const clipDecoded = decodeWav(clip44, 'clip.wav');

const settings: SourceSettings = { kind: 'recording', file: 'clip.wav', level: { kind: 'spl', dbSpl: 88 } };
const frames = (bytes: Uint8Array, label: string): WavFrameReader => new WavFrameReader(bytesReader(bytes), label);

describe('a streamed recording', () => {
  for (const [name, bytes, decoded] of [
    ['the bundled 48 kHz speech (no resampling)', speechBytes, speech],
    ['a 44.1 kHz clip (resampled to 48 kHz)', clip44, clipDecoded],
  ] as const) {
    it(`is calibrated, in passes over ${name}, to the decoded recording's gain, length, peak and activity`, () => {
      const held = calibratedSource(settings, 48000, { samples: decoded.mono, sampleRateHertz: decoded.sampleRateHertz, label: name });
      const streamed = calibrateRecording(settings, 48000, frames(bytes, name));
      expect(streamed.samples).toBe(held.pascals.length);
      expect(streamed.peakPascals).toBe(held.peakPascals);
      expect(streamed.activityFactor).toBe(held.activityFactor);
      expect(streamed.targetDbSpl).toBe(88);
      expect(Math.abs(streamed.sumSquaresPascals / held.sumSquaresPascals - 1)).toBeLessThan(1e-12);
      const { reader } = openSource(settings, 48000, { frames: frames(bytes, name), calibration: streamed });
      const out = new Float64Array(held.pascals.length);
      const rng = new SeededRandom(9);
      for (let at = 0; at < out.length; ) {
        const n = Math.min(out.length - at, 1 + Math.floor(rng.uniform() * 3000));
        reader.read(out.subarray(at, at + n));
        at += n;
      }
      expect(out).toEqual(held.pascals); // bit for bit, in chunks of any size
    });
  }

  it('measures its calibration itself when none is given, and refuses a calibration of another length', () => {
    const opened = openSource(settings, 48000, { frames: frames(clip44, 'clip.wav') });
    expect(opened.calibrated.samples).toBe(Math.round((clipDecoded.mono.length * 48000) / 44100));
    expect(opened.calibrated.pascals.length).toBe(0); // nothing held
    const wrong = { ...calibrateRecording(settings, 48000, frames(speechBytes, 'x')) };
    expect(() => openSource(settings, 48000, { frames: frames(clip44, 'clip.wav'), calibration: wrong })).toThrow(InputError);
  });

  it('renders the same far end, taps and report as the decoded recording, and hands its source out chunk by chunk', () => {
    const scenario = linkScenario({ kind: 'recording', file: 'clip.wav', level: { dbSpl: 100 } });
    const taps = ['source.pascals', 'transmitter.led', 'speaker.volts'];
    const held = renderScenario(scenario, { taps, recording: { samples: clipDecoded.mono, sampleRateHertz: 44100, label: 'clip.wav' } });
    const chunks: Float64Array[] = [];
    const streamed = renderScenario(scenario, { taps, streamedRecording: { frames: frames(clip44, 'clip.wav') }, onSource: (c) => chunks.push(c) });
    expect(streamed.sourcePascals.length).toBe(0);
    expect(streamed.farEndVolts).toEqual(held.farEndVolts);
    for (let i = 0; i < taps.length; i++) expect(streamed.taps[i].samples).toEqual(held.taps[i].samples);
    const joined = new Float64Array(chunks.reduce((n, c) => n + c.length, 0));
    chunks.reduce((at, c) => (joined.set(c, at), at + c.length), 0);
    expect(joined).toEqual(held.sourcePascals);
    const figures = (r: typeof held) => ({ ...r.report, solver: null, microphone: { ...r.report.microphone, longTermDbSpl: 0 } });
    expect(figures(streamed)).toEqual(figures(held));
    expect(streamed.report.microphone.longTermDbSpl).toBeCloseTo(held.report.microphone.longTermDbSpl, 12);
  });

  it('names the byte when the file is truncated or its header claims more data than it holds', () => {
    const pcm = encodeWav(clipDecoded.mono, 44100, 'pcm16').bytes; // 44-byte header: data chunk at byte 36
    const cut = pcm.slice(0, pcm.length - 100);
    expect(() => frames(cut, 'cut.wav')).toThrow(/^cut\.wav byte 36: data chunk declares \d+ bytes but only \d+ follow \(file truncated\)/);
    const lying = pcm.slice();
    const view = new DataView(lying.buffer);
    view.setUint32(40, view.getUint32(40, true) + 8, true);
    expect(() => frames(lying, 'lying.wav')).toThrow(/^lying\.wav byte 36: /);
  });
});
