// Audio I/O: one line per module, add yours below.
export * from './wav-read.ts';
export * from './wav-write.ts';
export * from './speech-level.ts';
export * from './limiter.ts';
export * from './playback.ts';
