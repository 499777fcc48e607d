import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { resample } from '../../src/audio/resample.ts';
import { decodeWav } from '../../src/audio/wav-read.ts';
import { encodeWav } from '../../src/audio/wav-write.ts';
import { openWavFile } from '../../src/cli/files.ts';
import { renderScenario } from '../../src/link/chain/chain.ts';
import { renderPipelined } from '../../src/worker/node-pipeline.ts';
import { InputError } from '../../src/errors.ts';
import { linkScenario } from '../analysis/link-fixture.ts';

const withoutTimes = (report: ReturnType<typeof renderScenario>['report']) => ({
  ...report,
  solver: { ...report.solver, wallSeconds: 0, transmitterSeconds: 0, receiverSeconds: 0 },
});

describe('renderPipelined', () => {
  it('gives, with the transmitter on a worker thread, exactly the render of renderScenario', async () => {
    const scenario = linkScenario({ kind: 'speech-like', seconds: 0.25, level: { dbSpl: 112 } });
    const taps = ['transmitter.led', 'light.detectorWatts', 'receiver.pc', 'speaker.volts'];
    const one = renderScenario(scenario, { taps });
    const two = await renderPipelined(scenario, { taps });
    expect(two.farEndVolts).toEqual(one.farEndVolts);
    expect(two.sourcePascals).toEqual(one.sourcePascals);
    expect(two.taps.map((t) => t.name)).toEqual(one.taps.map((t) => t.name));
    for (let i = 0; i < one.taps.length; i++) expect(two.taps[i].samples).toEqual(one.taps[i].samples);
    expect(withoutTimes(two.report)).toEqual(withoutTimes(one.report));
    expect(one.report.led.cutoff.count).toBeGreaterThan(0); // the check covers the interval lists too
  });

  it('streams a recording from its file in the worker thread and gives the one-thread render, source chunks included', async () => {
    const speech = decodeWav(readFileSync(new URL('../../samples/speech/bay-talkback.wav', import.meta.url)), 'speech');
    const file = join(mkdtempSync(join(tmpdir(), 'glowtalk-pipe-')), 'clip.wav');
    writeFileSync(file, encodeWav(resample(speech.mono.slice(24000, 36000), 48000, 22050), 22050, 'pcm16').bytes);
    const scenario = linkScenario({ kind: 'recording', file, level: { dbSpl: 100 } });
    const taps = ['transmitter.led', 'speaker.volts'];
    const run = async (threads: 1 | 2) => {
      const input = openWavFile(file);
      const source: Float64Array[] = [];
      let peak = 0;
      try {
        const options = { taps, streamedRecording: { frames: input.frames, file }, onSource: (c: Float64Array) => source.push(c), onStart: (i: { sourcePeakPascals: number }) => (peak = i.sourcePeakPascals) };
        const result = threads === 1 ? renderScenario(scenario, options) : await renderPipelined(scenario, options);
        return { result, source: Float64Array.from(source.flatMap((c) => [...c])), peak };
      } finally {
        input.close();
      }
    };
    const one = await run(1);
    const two = await run(2);
    expect(two.result.farEndVolts).toEqual(one.result.farEndVolts);
    for (let i = 0; i < taps.length; i++) expect(two.result.taps[i].samples).toEqual(one.result.taps[i].samples);
    expect(two.source).toEqual(one.source);
    const fileFrames = Math.round((12000 * 22050) / 48000);
    expect(two.source.length).toBe(Math.round((fileFrames * 48000) / 22050)); // the file's frames at 48 kHz
    expect(two.peak).toBe(one.peak);
    expect(two.peak).toBe(two.source.reduce((m, v) => Math.max(m, Math.abs(v)), 0));
    expect(withoutTimes(two.result.report)).toEqual(withoutTimes(one.result.report));
  });

  it('passes a user error from the worker thread back as an InputError', async () => {
    const scenario = linkScenario();
    await expect(renderPipelined(scenario, { taps: ['transmitter.nowhere'] })).rejects.toBeInstanceOf(InputError);
  });
});
