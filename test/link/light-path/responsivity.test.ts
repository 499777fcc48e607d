import { describe, expect, it } from 'vitest';
import { responsivityAmperesPerWatt } from '../../../src/link/light-path/responsivity.ts';

describe('photodetector responsivity', () => {
  // R = η·q·λ/(h·c) with exact SI 2019 constants: 630e-9·1.602176634e-19/(6.62607015e-34·299792458) = 0.508129 A/W.
  it.each([
    [1, 630e-9, 0.508129],
    [0.8, 630e-9, 0.406503],
    [1, 460e-9, 0.371015],
    [0.8, 460e-9, 0.296812],
  ])('is η·qλ/hc: η = %d at %d m gives %d A/W', (eta, metres, expected) => {
    expect(Math.abs(responsivityAmperesPerWatt(eta, metres) - expected)).toBeLessThan(1e-6);
  });

  it('refuses a wavelength in nanometres', () => {
    expect(() => responsivityAmperesPerWatt(0.8, 630)).toThrow(/wavelengthMetres: got 630/);
  });
});
