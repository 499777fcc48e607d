/**
 * Files in and out of the page: WAV import (decoded by the core, errors name
 * the byte), WAV export of any signal (encoded by the core), scenario save,
 * and handing bytes to the browser as a download.
 */
import { decodeWav } from '../../src/audio/wav-read.ts';
import { encodeWav, type WavSampleFormat } from '../../src/audio/wav-write.ts';
import type { StoredRecording } from './workbench-store.ts';

export async function readWavFile(file: File): Promise<StoredRecording> {
  const bytes = new Uint8Array(await file.arrayBuffer());
  const decoded = decodeWav(bytes, file.name);
  return { name: file.name, samples: decoded.mono, sampleRateHertz: decoded.sampleRateHertz, origin: 'imported' };
}

export interface ExportSignal {
  /** File name stem, e.g. "far-end" or "tap-transmitter.led". */
  stem: string;
  samples: ArrayLike<number>;
  rateHertz: number;
  /** Multiplies the samples (the listening gain for the far end, 1/peak for the source). */
  scale: number;
  format: WavSampleFormat;
}

export function wavBytes(signal: ExportSignal): { bytes: Uint8Array; clippedSamples: number } {
  const scaled = new Float64Array(signal.samples.length);
  for (let i = 0; i < scaled.length; i++) scaled[i] = signal.samples[i] * signal.scale;
  return encodeWav(scaled, Math.round(signal.rateHertz), signal.format);
}

export function download(bytes: Uint8Array | string, fileName: string, type: string): void {
  const blob = new Blob([typeof bytes === 'string' ? bytes : (bytes as Uint8Array<ArrayBuffer>)], { type });
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  a.style.display = 'none';
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

export function safeStem(text: string): string {
  return text.replace(/\.json$/i, '').replace(/[^A-Za-z0-9_.-]+/g, '_').replace(/^_+|_+$/g, '') || 'scenario';
}
