import { describe, expect, it } from 'vitest';
import {
  dbSplToPascals,
  levelAtDistanceDbSpl,
  pascalsToDbSpl,
  REFERENCE_PRESSURE_PASCALS,
  SPEECH_LEVEL_AT_ONE_METRE_DB_SPL,
  speechLevelDbSpl,
} from '../../../src/link/acoustics/sound-level.ts';
import { InputError } from '../../../src/errors.ts';

describe('sound pressure level re 20 µPa', () => {
  // Definition Lp = 20·log10(p/p0), p0 = 20 µPa (ISO 1683; ANSI S1.1); values evaluated by hand.
  it('94 dB SPL is 1.002374 Pa rms', () => {
    expect(dbSplToPascals(94)).toBeCloseTo(1.002374, 6);
    expect(Math.abs(dbSplToPascals(94) / 1.0023744672545452 - 1)).toBeLessThan(1e-12);
  });

  it('1 Pa rms is 93.9794 dB SPL', () => {
    expect(pascalsToDbSpl(1)).toBeCloseTo(93.9794, 4);
  });

  it('0 dB SPL is the 20 µPa reference and the conversions invert each other', () => {
    expect(dbSplToPascals(0)).toBe(REFERENCE_PRESSURE_PASCALS);
    for (const level of [-10, 0, 20.5, 62.35, 94, 140]) {
      expect(pascalsToDbSpl(dbSplToPascals(level))).toBeCloseTo(level, 10);
    }
  });

  it('silence is −Infinity dB and a negative pressure is refused with the field named', () => {
    expect(pascalsToDbSpl(0)).toBe(-Infinity);
    expect(() => pascalsToDbSpl(-1)).toThrow(InputError);
    expect(() => pascalsToDbSpl(-1)).toThrow(/rmsPascals: got -1; expected a non-negative RMS pressure/);
    expect(() => dbSplToPascals(Number.NaN)).toThrow(/levelDbSpl/);
  });
});

describe('speech levels by vocal effort and distance', () => {
  // ANSI S3.5-1997 Table 3 overall levels at 1 m, as reproduced in the public SII code
  // Eomys/MoSQITo, mosqito/sq_metrics/speech_intelligibility/sii_ansi/_speech_data.py.
  it('holds the ANSI S3.5-1997 levels at 1 m: normal 62.35, raised 68.34, loud 74.85, shout 82.30 dB SPL', () => {
    expect(SPEECH_LEVEL_AT_ONE_METRE_DB_SPL).toEqual({ normal: 62.35, raised: 68.34, loud: 74.85, shout: 82.3 });
  });

  // ANSI S3.5-1997 normal level plus the point-source inverse-distance law L(r) = L(1 m) − 20·log10(r).
  it('normal speech is 72.808 dB SPL at 0.3 m and 56.329 dB SPL at 2 m', () => {
    expect(speechLevelDbSpl('normal', 0.3)).toBeCloseTo(72.808, 3);
    expect(speechLevelDbSpl('normal', 2)).toBeCloseTo(56.329, 3);
  });

  // Inverse-distance law: 20·log10(2) = 6.0206 dB per doubling of distance.
  it('loses 6.0206 dB per doubling of distance', () => {
    expect(levelAtDistanceDbSpl(80, 1) - levelAtDistanceDbSpl(80, 2)).toBeCloseTo(6.0206, 4);
    expect(levelAtDistanceDbSpl(80, 1)).toBe(80);
  });

  it('refuses a distance that is not positive and an unknown vocal effort', () => {
    expect(() => levelAtDistanceDbSpl(62.35, 0)).toThrow(/distanceMetres: got 0; expected a positive distance/);
    expect(() => speechLevelDbSpl('whisper' as never, 1)).toThrow(/vocalEffort: got "whisper"; expected one of normal, raised, loud, shout/);
  });
});
