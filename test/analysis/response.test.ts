import { describe, expect, it } from 'vitest';
import { chainResponse, responseScenario, RESPONSE_DEFAULTS, type ResponseOptions } from '../../src/analysis/response.ts';
import { steadyWindow } from '../../src/analysis/link-metrics.ts';
import { thd } from '../../src/analysis/thd.ts';
import { renderScenario } from '../../src/link/chain/chain.ts';
import { loadScenario, setScenarioValue } from '../../src/scenario/index.ts';
import { linkJson, NO_FILES } from './link-fixture.ts';

const OPTIONS: ResponseOptions = { ...RESPONSE_DEFAULTS, seconds: 0.6, harmonicCount: 2, levelDbSpl: 60, pointsPerOctave: 24 };

/** The test link with a linear receiver (30 dB coupling loss keeps the phototransistor out of saturation). */
function linkWith(receiverParts: unknown[] | null) {
  const json = setScenarioValue(linkJson(), 'lightPath.channel.couplingLoss', 30) as ReturnType<typeof linkJson>;
  if (receiverParts) (json.receiver as { circuit: { parts: unknown[] } }).circuit.parts = receiverParts;
  return loadScenario(json, NO_FILES, 'test-link');
}

function measure(scenario: ReturnType<typeof linkWith>) {
  const s = responseScenario(scenario, OPTIONS);
  const result = renderScenario(s);
  return { response: chainResponse(s, result, OPTIONS), result };
}

// The filter's resistances are large against RL, so the phototransistor's collector load (and with it its
// own Miller roll-off near 10 kHz) barely changes when CF is added: dividing the two responses leaves the RC.
const receiver = (withFilter: boolean) => [
  { ref: 'VCC', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: 12 },
  { ref: 'Q1', kind: 'phototransistor', pins: ['pc', 'gnd'], model: 'generic-phototransistor' },
  { ref: 'RL', kind: 'resistor', pins: ['vcc', 'pc'], value: '2.2k' },
  { ref: 'C1', kind: 'capacitor', pins: ['pc', 'a'], value: '10u' },
  { ref: 'RF', kind: 'resistor', pins: ['a', 'spk'], value: '47k' },
  ...(withFilter ? [{ ref: 'CF', kind: 'capacitor', pins: ['spk', 'gnd'], value: '2.2n' }] : []),
  { ref: 'RSPK', kind: 'resistor', pins: ['spk', 'gnd'], value: '100k' },
];

describe('chainResponse', () => {
  it('shows a first-order RC low-pass after the receiver as |H| = 1/√(1 + (f/fc)²), fc = 1/(2π·C·(Rsource ∥ Rload))', () => {
    // First-order RC divider (any circuit-theory text): the phototransistor is a current source, so the
    // filter sees RL + RF = 49.2 kΩ on one side and the 100 kΩ load on the other: fc = 1/(2π·2.2 nF·32.98 kΩ) = 2193 Hz.
    const flat = measure(linkWith(receiver(false))).response;
    const filtered = measure(linkWith(receiver(true))).response;
    const fc = 1 / (2 * Math.PI * 2.2e-9 * ((49200 * 100000) / 149200));
    for (const [i, point] of filtered.points.entries()) {
      if (!point.reliable || point.hertz > 8000) continue;
      const expected = -10 * Math.log10(1 + (point.hertz / fc) ** 2);
      expect(Math.abs(point.magnitudeDb - flat.points[i].magnitudeDb - expected)).toBeLessThan(0.05);
    }
    // The corner reported is where the response has fallen 3 dB below its value at 1 kHz.
    const corner = filtered.upperCornerHertz!;
    const before = filtered.points.filter((p) => p.hertz <= corner).at(-1)!;
    const after = filtered.points.find((p) => p.hertz > corner)!;
    expect(before.relativeDb).toBeGreaterThan(-3);
    expect(after.relativeDb).toBeLessThanOrEqual(-3);
    expect(flat.upperCornerHertz!).toBeGreaterThan(corner); // the phototransistor's own roll-off, near 9 kHz here
  });

  it('agrees with a steady 1 kHz tone: the same gain in V/Pa, and HD2 within 1 dB of thd()', () => {
    // Farina (AES 2000): the deconvolved n-th harmonic response is the level of the n-th harmonic a
    // steady sine of that frequency would produce; thd() reads it from a tone render by power summation.
    const scenario = linkWith(null);
    const { response } = measure(scenario);
    const tone = { ...scenario, source: { kind: 'tone' as const, frequencyHertz: 1000, seconds: 0.3, level: { kind: 'spl' as const, dbSpl: 60 } } };
    const result = renderScenario(tone);
    const w = steadyWindow(result.farEndVolts.length, 48000);
    const far = thd(result.farEndVolts.subarray(w.start, w.end), 48000, { fundamentalHertz: 1000, harmonicCount: 2 });
    const pascalsPeak = 20e-6 * 10 ** (60 / 20) * Math.SQRT2;
    expect(response.referenceDb).toBeCloseTo(20 * Math.log10(far.fundamentalAmplitude / pascalsPeak), 1);
    const at1k = response.points.find((p) => Math.abs(p.hertz - 1000) < 1)!;
    expect(Math.abs(at1k.harmonicsDbc[0]! - far.harmonics[0].dbc)).toBeLessThan(1);
  });

  it('is within 0.1 dB (HD2 within 1 dB) of a steady tone at the lowest frequency it calls reliable, and says nothing of harmonics below it', () => {
    const scenario = linkWith(null);
    const { response } = measure(scenario);
    const lowest = response.points.find((p) => p.reliable)!;
    expect(lowest.hertz).toBeGreaterThanOrEqual(response.lowestReliableHertz);
    const tone = { ...scenario, source: { kind: 'tone' as const, frequencyHertz: lowest.hertz, seconds: 0.3, level: { kind: 'spl' as const, dbSpl: 60 } } };
    const result = renderScenario(tone);
    const w = steadyWindow(result.farEndVolts.length, 48000);
    const far = thd(result.farEndVolts.subarray(w.start, w.end), 48000, { fundamentalHertz: lowest.hertz, harmonicCount: 2 });
    const pascalsPeak = 20e-6 * 10 ** (60 / 20) * Math.SQRT2;
    expect(Math.abs(lowest.magnitudeDb - 20 * Math.log10(far.fundamentalAmplitude / pascalsPeak))).toBeLessThan(0.1);
    const withHarmonics = response.points.find((p) => p.harmonicsDbc[0] !== null)!;
    expect(withHarmonics.hertz).toBeGreaterThanOrEqual(response.lowestReliableHarmonicHertz);
    expect(response.points.filter((p) => p.hertz < response.lowestReliableHarmonicHertz).every((p) => p.harmonicsDbc[0] === null)).toBe(true);
    if (withHarmonics === lowest) expect(Math.abs(lowest.harmonicsDbc[0]! - far.harmonics[0].dbc)).toBeLessThan(1);
  });
});
