/**
 * Sound pressure level and speech levels.
 *
 * Lp = 20·log10(p_rms / p0), p0 = 20 µPa (the reference pressure for sound in air).
 * Speech levels are the overall levels at 1 m in front of the talker for four vocal
 * efforts, ANSI S3.5-1997 (Speech Intelligibility Index), Table 3.
 */
import { InputError } from '../../errors.ts';
import { as, type DbSpl, type Metres, type Pascals } from '../../units/types.ts';
import { describeValue } from '../settings-checks.ts';

/** Reference sound pressure in air, 20 µPa. */
export const REFERENCE_PRESSURE_PASCALS = 20e-6;

/** Overall speech level at 1 m by vocal effort, dB SPL (ANSI S3.5-1997 Table 3). */
export const SPEECH_LEVEL_AT_ONE_METRE_DB_SPL = {
  normal: 62.35,
  raised: 68.34,
  loud: 74.85,
  shout: 82.3,
} as const;

export type VocalEffort = keyof typeof SPEECH_LEVEL_AT_ONE_METRE_DB_SPL;
export const VOCAL_EFFORTS = Object.keys(SPEECH_LEVEL_AT_ONE_METRE_DB_SPL) as VocalEffort[];

/** RMS pressure in pascals for a level in dB SPL. */
export function dbSplToPascals(levelDbSpl: number): Pascals {
  if (typeof levelDbSpl !== 'number' || !Number.isFinite(levelDbSpl)) {
    throw new InputError('levelDbSpl', 'a finite level in dB SPL', `got ${describeValue(levelDbSpl)}`);
  }
  return as<Pascals>(REFERENCE_PRESSURE_PASCALS * 10 ** (levelDbSpl / 20));
}

/** Level in dB SPL for an RMS pressure; silence (0 Pa) is −Infinity dB. */
export function pascalsToDbSpl(rmsPascals: number): DbSpl {
  if (typeof rmsPascals !== 'number' || !Number.isFinite(rmsPascals) || rmsPascals < 0) {
    throw new InputError('rmsPascals', 'a non-negative RMS pressure in pascals', `got ${describeValue(rmsPascals)}`);
  }
  return as<DbSpl>(20 * Math.log10(rmsPascals / REFERENCE_PRESSURE_PASCALS));
}

/**
 * Level at `distanceMetres` from a small source whose level at 1 m is known:
 * L(r) = L(1 m) − 20·log10(r / 1 m), the inverse-distance (spherical spreading) law
 * of a point source in the free field (6.02 dB per doubling of distance).
 */
export function levelAtDistanceDbSpl(levelAtOneMetreDbSpl: number, distanceMetres: Metres | number): DbSpl {
  if (typeof levelAtOneMetreDbSpl !== 'number' || !Number.isFinite(levelAtOneMetreDbSpl)) {
    throw new InputError('levelAtOneMetreDbSpl', 'a finite level in dB SPL', `got ${describeValue(levelAtOneMetreDbSpl)}`);
  }
  if (typeof distanceMetres !== 'number' || !Number.isFinite(distanceMetres) || distanceMetres <= 0) {
    throw new InputError('distanceMetres', 'a positive distance in metres', `got ${describeValue(distanceMetres)}`);
  }
  return as<DbSpl>(levelAtOneMetreDbSpl - 20 * Math.log10(distanceMetres));
}

/** Speech level at the microphone for a vocal effort and talker distance. */
export function speechLevelDbSpl(effort: VocalEffort, distanceMetres: Metres | number): DbSpl {
  if (!Object.hasOwn(SPEECH_LEVEL_AT_ONE_METRE_DB_SPL, effort)) {
    throw new InputError('vocalEffort', `one of ${VOCAL_EFFORTS.join(', ')}`, `got ${describeValue(effort)}`);
  }
  return levelAtDistanceDbSpl(SPEECH_LEVEL_AT_ONE_METRE_DB_SPL[effort], distanceMetres);
}
