import { describe, expect, it } from 'vitest';
import { checkLightGuideSettings, lightGuideLossDb, lightGuideTransmission } from '../../../src/link/light-path/light-guide.ts';

describe('light guide', () => {
  // Definition of optical loss in decibels, T = 10^(−dB/10): 0.15 dB/m × 10 m = 1.5 dB → T = 0.7079458.
  it('loses 1.5 dB over 10 m at 0.15 dB/m, passing 0.707946 of the power', () => {
    const guide = { couplingLossDb: 0, attenuationDbPerMetre: 0.15, lengthMetres: 10 };
    expect(lightGuideLossDb(guide)).toBeCloseTo(1.5, 12);
    expect(Math.abs(lightGuideTransmission(guide) - 0.707946)).toBeLessThan(1e-6);
  });

  // Decibels add: 3 dB coupling + 1.5 dB along the guide = 4.5 dB → T = 10^(−0.45) = 0.3548134.
  it('adds the coupling loss to the attenuation along the guide', () => {
    const guide = { couplingLossDb: 3, attenuationDbPerMetre: 0.15, lengthMetres: 10 };
    expect(lightGuideLossDb(guide)).toBeCloseTo(4.5, 12);
    expect(lightGuideTransmission(guide)).toBeCloseTo(0.3548134, 7);
  });

  it('passes everything when it has no loss and no length', () => {
    expect(lightGuideTransmission({ couplingLossDb: 0, attenuationDbPerMetre: 0.2, lengthMetres: 0 })).toBe(1);
  });

  it('names the field of bad settings', () => {
    expect(() => checkLightGuideSettings({ couplingLossDb: 1, attenuationDbPerMetre: -0.1, lengthMetres: 2 })).toThrow(
      /lightPath\.attenuationDbPerMetre: got -0.1; expected an attenuation from 0 to 100 dB per metre/,
    );
    expect(() => checkLightGuideSettings({ couplingLossDb: 1, attenuationDbPerMetre: 0.1 })).toThrow(/lightPath\.lengthMetres: got nothing/);
  });
});
