/** Decibel conversions with a floor, so silence gives a finite number, never −Infinity or NaN. */

/** Lowest level reported: far below any double-precision measurement (about 1e−15 of full scale is −300 dB). */
export const FLOOR_DB = -300;

/** 20·log10(ratio) of an amplitude ratio, floored at FLOOR_DB. */
export function amplitudeDb(ratio: number): number {
  return ratio > 0 ? Math.max(FLOOR_DB, 20 * Math.log10(ratio)) : FLOOR_DB;
}

/** 10·log10(ratio) of a power ratio, floored at FLOOR_DB. */
export function powerDb(ratio: number): number {
  return ratio > 0 ? Math.max(FLOOR_DB, 10 * Math.log10(ratio)) : FLOOR_DB;
}
