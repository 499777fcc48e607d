/** Metrics over sample arrays: spectra, levels, distortion, intelligibility, sweeps. */
export * from './windows.ts';
export { fftConvolve, nextPowerOfTwo } from './fft.ts';
export * from './spectrum.ts';
export * from './sine-fit.ts';
export * from './levels.ts';
export { thd, type ThdOptions, type ThdResult, type HarmonicLevel } from './thd.ts';
export * from './thd-plus-noise.ts';
export * from './intermodulation.ts';
export * from './align.ts';
export * from './segmental-snr.ts';
export * from './stoi.ts';
export * from './swept-sine.ts';
export { FLOOR_DB, amplitudeDb, powerDb } from './decibels.ts';
