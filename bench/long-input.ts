/**
 * `npm run bench:long [-- MINUTES [--workers 1|2] [--format pcm16|float32]]`: renders
 * long recordings with `glowtalk render` in a child process and prints, for each
 * duration, the wall time, the seconds of render per minute of audio and the child's
 * peak resident memory (its process.resourceUsage().maxRSS, worker thread included).
 * Time should grow in proportion to the duration and memory should stay flat.
 *
 * The inputs are written streaming into a temporary directory by looping
 * samples/speech/bay-talkback.wav (48 kHz mono), and deleted afterwards with the
 * outputs. MINUTES is a comma-separated list (default 1,10,60).
 */
import { spawnSync } from 'node:child_process';
import { closeSync, mkdtempSync, openSync, readFileSync, rmSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import * as path from 'node:path';
import { fileURLToPath } from 'node:url';
import { decodeWav } from '../src/audio/wav-read.ts';
import { WavStreamEncoder } from '../src/audio/wav-stream.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const args = process.argv.slice(2);
const flag = (name: string, fallback: string): string => {
  const at = args.indexOf(name);
  return at >= 0 && at + 1 < args.length ? args[at + 1] : fallback;
};
const minutesList = (args.find((a) => /^[\d.,]+$/.test(a)) ?? '1,10,60').split(',').map(Number);
const workers = flag('--workers', '2');
const format = flag('--format', 'pcm16');
if (format !== 'pcm16' && format !== 'float32') throw new Error(`--format: pcm16 or float32, got ${format}`);
const rate = 48000;

const speech = decodeWav(readFileSync(path.join(root, 'samples/speech/bay-talkback.wav')), 'bay-talkback.wav');
if (speech.sampleRateHertz !== rate) throw new Error('the loop recording should be 48 kHz');

/** Writes `minutes` of the looped speech as a mono WAV, one block at a time. */
function writeLongWav(file: string, minutes: number): void {
  const frames = Math.round(minutes * 60 * rate);
  const encoder = new WavStreamEncoder(frames, rate, format as 'pcm16' | 'float32');
  const fd = openSync(file, 'w');
  try {
    writeSync(fd, encoder.header());
    const loop = speech.mono;
    for (let at = 0; at < frames; ) {
      const offset = at % loop.length;
      const n = Math.min(loop.length - offset, frames - at);
      writeSync(fd, encoder.encode(loop.subarray(offset, offset + n)));
      at += n;
    }
    writeSync(fd, encoder.trailer());
  } finally {
    closeSync(fd);
  }
}

// Loaded into the child before the CLI: reports its peak RSS (kB) on stderr as it exits.
const probe = `data:text/javascript,process.on('exit',()=>process.stderr.write('maxrss-kb '+process.resourceUsage().maxRSS+'\\n'))`;

const temporary = mkdtempSync(path.join(tmpdir(), 'glowtalk-long-'));
try {
  console.log(`glowtalk render samples/demo-bay/scenario.json --input <looped speech, ${format} 48 kHz mono> --workers ${workers}`);
  for (const minutes of minutesList) {
    const input = path.join(temporary, `speech-${minutes}min.wav`);
    writeLongWav(input, minutes);
    const out = path.join(temporary, `out-${minutes}min`);
    const started = performance.now();
    const child = spawnSync(
      process.execPath,
      ['--import', probe, path.join(root, 'bin/glowtalk.mjs'), 'render', path.join(root, 'samples/demo-bay/scenario.json'), '--input', input, '--out', out, '--workers', workers, '--no-progress'],
      { cwd: root, encoding: 'utf8', maxBuffer: 1 << 24 },
    );
    const wallSeconds = (performance.now() - started) / 1000;
    if (child.status !== 0) throw new Error(`render of ${minutes} min failed (exit ${child.status}):\n${child.stderr}`);
    const rss = /maxrss-kb (\d+)/.exec(child.stderr);
    const peakMb = rss ? Number(rss[1]) / 1024 : NaN;
    const row = `${String(minutes).padStart(4)} min: ${wallSeconds.toFixed(1).padStart(8)} s wall, ${(wallSeconds / minutes).toFixed(1).padStart(6)} s per audio minute, peak RSS ${peakMb.toFixed(0)} MB`;
    console.log(row);
    rmSync(out, { recursive: true, force: true });
    rmSync(input, { force: true });
  }
} finally {
  rmSync(temporary, { recursive: true, force: true });
}
