import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { decodeWav } from '../../src/audio/wav-read.ts';
import { encodeWav } from '../../src/audio/wav-write.ts';
import { tone } from '../../src/audio/signals/tone.ts';
import { main } from '../../src/cli/main.ts';
import { renderScenario } from '../../src/link/chain/chain.ts';
import { loadScenarioText } from '../../src/scenario/index.ts';

/** A small link of our own (not a demo), written to a temporary folder as real files. */
function writeLink(dir: string): string {
  writeFileSync(
    join(dir, 'tx.json'),
    JSON.stringify({
      format: 'glowtalk.circuit/1',
      parts: [
        { ref: 'VCC', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: 9 },
        { ref: 'VMIC', kind: 'voltage-source', pins: ['mic', 'gnd'], wave: { shape: 'upstream' } },
        { ref: 'C1', kind: 'capacitor', pins: ['mic', 'b'], value: '10u' },
        { ref: 'R1', kind: 'resistor', pins: ['vcc', 'b'], value: '47k' },
        { ref: 'R2', kind: 'resistor', pins: ['b', 'gnd'], value: '10k' },
        { ref: 'Q1', kind: 'npn', pins: ['k', 'b', 'e'], model: 'generic-npn' },
        { ref: 'RE', kind: 'resistor', pins: ['e', 'gnd'], value: '220' },
        { ref: 'D1', kind: 'led', pins: ['vcc', 'k'], model: 'generic-red-led' },
      ],
    }),
  );
  writeFileSync(
    join(dir, 'rx.json'),
    JSON.stringify({
      format: 'glowtalk.circuit/1',
      parts: [
        { ref: 'VCC', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: 9 },
        { ref: 'Q1', kind: 'phototransistor', pins: ['pc', 'gnd'], model: 'generic-phototransistor' },
        { ref: 'RL', kind: 'resistor', pins: ['vcc', 'pc'], value: '1k' },
        { ref: 'C1', kind: 'capacitor', pins: ['pc', 'spk'], value: '100u' },
        { ref: 'RSPK', kind: 'resistor', pins: ['spk', 'gnd'], value: 8 },
      ],
    }),
  );
  const scenario = join(dir, 'link.json');
  writeFileSync(
    scenario,
    JSON.stringify({
      format: 'glowtalk.scenario/1',
      source: { kind: 'tone', frequency: 1000, seconds: 0.2, level: { dbSpl: 94 } },
      microphone: { sensitivity: -44, outputResistance: '2.2k', selfNoise: null },
      transmitter: { circuit: 'tx.json', input: 'VMIC', led: 'D1' },
      lightPath: { channel: { kind: 'light-guide', length: 1, couplingLoss: 2, attenuation: 0.2 }, ambient: null },
      receiver: { circuit: 'rx.json', detector: 'Q1', output: ['spk', 'gnd'], speaker: null },
      output: { listeningGain: 0, format: 'float32' },
      taps: ['transmitter.led'],
    }),
  );
  return scenario;
}

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await main(args, { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}

describe('glowtalk render', () => {
  it('writes the far end, the taps and report.json, and says what happened', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'glowtalk-render-'));
    const scenario = writeLink(dir);
    const outDir = join(dir, 'out');
    const { code, out, err } = await run(['render', scenario, '--out', outDir, '--tap', 'light.detectorWatts', '--no-progress']);
    expect(err).toBe('');
    expect(code).toBe(0);
    expect(out).toMatch(/Talker at the microphone: 94\.0 dB SPL/);
    expect(readdirSync(outDir).sort()).toEqual(['far-end.wav', 'report.json', 'source.wav', 'tap-light.detectorWatts.wav', 'tap-transmitter.led.wav']);
    const far = decodeWav(readFileSync(join(outDir, 'far-end.wav')), 'far-end.wav');
    expect(far.sampleRateHertz).toBe(48000);
    expect(far.mono.length).toBe(0.2 * 48000);
    const report = JSON.parse(readFileSync(join(outDir, 'report.json'), 'utf8'));
    expect(report.durationSeconds).toBeCloseTo(0.2, 12);
    expect(report.microphone.targetDbSpl).toBe(94);
    expect(report.led.minimumAmperes).toBeLessThan(report.led.restingAmperes);
    expect(report.settings).toBeTypeOf('object');
    expect(report.files['far-end']).toBe(join(outDir, 'far-end.wav'));
    const led = decodeWav(readFileSync(join(outDir, 'tap-transmitter.led.wav')), 'tap');
    expect(led.sampleRateHertz).toBe(192000);
    // The tap holds amperes: its mean is the LED's mean current from the report.
    const mean = led.mono.reduce((a, v) => a + v, 0) / led.mono.length;
    expect(mean).toBeCloseTo(report.led.meanAmperes, 5);
  });

  it('renders a user-supplied WAV in place of the scenario source and never overwrites it', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'glowtalk-render-'));
    const scenario = writeLink(dir);
    const input = join(dir, 'far-end.wav');
    const bytes = encodeWav(tone({ sampleRateHertz: 44100, frequencyHertz: 500, peakAmplitude: 0.5, seconds: 0.15 }), 44100, 'pcm16').bytes;
    writeFileSync(input, bytes);
    const clash = await run(['render', scenario, '--input', input, '--out', dir, '--no-progress']);
    expect(clash.code).toBe(2);
    expect(clash.err.trim().split('\n')).toHaveLength(1);
    expect(clash.err).toMatch(/overwrite an input/);
    expect(Buffer.compare(readFileSync(input), Buffer.from(bytes))).toBe(0);
    expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);

    const ok = await run(['render', scenario, '--input', input, '--out', join(dir, 'out'), '--no-progress', '--spl', '80']);
    expect(ok.code).toBe(0);
    const far = decodeWav(readFileSync(join(dir, 'out', 'far-end.wav')), 'far-end.wav');
    expect(far.mono.length).toBe(Math.round(0.15 * 48000)); // resampled to the scenario's 48 kHz
  });

  it('names the flag when a level override is malformed', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'glowtalk-render-'));
    const scenario = writeLink(dir);
    const bad = await run(['render', scenario, '--effort', 'whisper', '--no-progress']);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/^glowtalk: --effort: .*expected normal, raised, loud, shout/);
  });

  it('streams a WAV input: one and two threads write the same far end and source.wav as a render of the decoded file', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'glowtalk-render-'));
    const scenarioFile = writeLink(dir);
    const input = join(dir, 'talk.wav');
    const speech = decodeWav(readFileSync(new URL('../../samples/speech/bay-talkback.wav', import.meta.url)), 'speech');
    writeFileSync(input, encodeWav(speech.mono.slice(20000, 30000), 48000, 'pcm16').bytes);
    const files = (out: string) => ({ far: readFileSync(join(out, 'far-end.wav')), source: readFileSync(join(out, 'source.wav')) });
    for (const workers of ['1', '2']) {
      const r = await run(['render', scenarioFile, '--input', input, '--out', join(dir, `out${workers}`), '--spl', '85', '--format', 'float32', '--workers', workers, '--no-progress']);
      expect(r.err).toBe('');
      expect(r.code).toBe(0);
    }
    const one = files(join(dir, 'out1'));
    expect(Buffer.compare(files(join(dir, 'out2')).far, one.far)).toBe(0);
    expect(Buffer.compare(files(join(dir, 'out2')).source, one.source)).toBe(0);

    // The same scenario rendered in memory from the decoded file (listening gain 0 dB: the WAV holds volts as float32).
    const loaded = loadScenarioText(readFileSync(scenarioFile, 'utf8'), { readText: (f) => readFileSync(join(dir, f), 'utf8') }, scenarioFile);
    const scenario = { ...loaded, source: { kind: 'recording' as const, file: input, level: { kind: 'spl' as const, dbSpl: 85 } } };
    const decoded = decodeWav(readFileSync(input), input);
    const held = renderScenario(scenario, { recording: { samples: decoded.mono, sampleRateHertz: 48000, label: input } });
    expect(decodeWav(one.far, 'far').mono).toEqual(Float64Array.from(Float32Array.from(held.farEndVolts)));
    const peak = held.sourcePascals.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
    expect(decodeWav(one.source, 'source').mono).toEqual(Float64Array.from(Float32Array.from(held.sourcePascals, (v) => v / peak)));
    const report = JSON.parse(readFileSync(join(dir, 'out2', 'report.json'), 'utf8'));
    expect(report.microphone.peakDbSpl).toBeCloseTo(held.report.microphone.peakDbSpl, 12);
    expect(report.microphone.activityFactor).toBe(held.report.microphone.activityFactor);
    expect(report.durationSeconds).toBe(10000 / 48000);
  });

  it('names the byte when the input WAV is truncated or its header claims more data than the file holds', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'glowtalk-render-'));
    const scenario = writeLink(dir);
    const bytes = encodeWav(tone({ sampleRateHertz: 44100, frequencyHertz: 500, peakAmplitude: 0.5, seconds: 0.1 }), 44100, 'pcm16').bytes;
    const cut = join(dir, 'cut.wav');
    writeFileSync(cut, bytes.slice(0, 1000));
    const lying = join(dir, 'lying.wav');
    const lie = bytes.slice();
    new DataView(lie.buffer).setUint32(40, 8820 + 2, true); // 4410 frames of 2 bytes are there
    writeFileSync(lying, lie);
    for (const workers of ['1', '2']) {
      const a = await run(['render', scenario, '--input', cut, '--out', join(dir, 'out'), '--workers', workers, '--no-progress']);
      expect(a.code).toBe(2);
      expect(a.err).toBe(`glowtalk: ${cut} byte 36: data chunk declares 8820 bytes but only 956 follow (file truncated); expected 8820 bytes of sample data\n`);
      const b = await run(['render', scenario, '--input', lying, '--out', join(dir, 'out'), '--workers', workers, '--no-progress']);
      expect(b.code).toBe(2);
      expect(b.err).toMatch(/byte 36: data chunk declares 8822 bytes but only 8820 follow/);
    }
    expect(readdirSync(dir).filter((f) => f.startsWith('out'))).toEqual([]); // nothing written
  });
});
