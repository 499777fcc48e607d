/**
 * `npm run bench`: the demo link (samples/demo-bay) on its bundled speech clip.
 * Prints the real-time factor on one core (first render, and rendered again), microseconds per internal step for
 * each circuit, Newton iterations per step, the same clip nearly silent (what the kernels cost when
 * Newton hardly ever runs), peak memory, the accuracy against a
 * reference run (8× smaller steps, tight Newton tolerance) and the speed ratio
 * to the straightforward path (dense elimination with partial pivoting every
 * iteration) and to the same kernels run as JavaScript, the figure for the whole machine with the transmitter and the
 * receiver on two threads, and the time and peak memory of a streamed one-minute
 * render (`npm run bench:long` for 10 and 60 minutes). The last line is
 * `realtime-factor: N` (one core).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import * as path from 'node:path';
import { decodeWav } from '../src/audio/wav-read.ts';
import { DEFAULT_SUBSTEPS, renderScenario, type RenderOptions } from '../src/link/chain/chain.ts';
import { loadScenarioText } from '../src/scenario/index.ts';
import { TIGHT_TOLERANCES } from '../src/solver/newton.ts';

const scenarioFile = process.argv[2] ?? 'samples/demo-bay/scenario.json';
const base = path.dirname(scenarioFile);
const scenario = loadScenarioText(readFileSync(scenarioFile, 'utf8'), { readText: (p) => readFileSync(path.resolve(base, p), 'utf8') }, scenarioFile);
if (scenario.source.kind !== 'recording') throw new Error('the benchmark wants a scenario with a recording');
const decoded = decodeWav(readFileSync(path.resolve(base, scenario.source.file)), scenario.source.file);
const recording = { samples: decoded.mono, sampleRateHertz: decoded.sampleRateHertz, label: scenario.source.file };

function timed(seconds: number | null, options: RenderOptions): { wall: number; cpu: number; result: ReturnType<typeof renderScenario> } {
  const samples = seconds === null ? recording.samples : recording.samples.subarray(0, Math.round(seconds * recording.sampleRateHertz));
  const started = performance.now();
  const cpu = process.cpuUsage();
  const result = renderScenario(scenario, { ...options, recording: { ...recording, samples } });
  return { wall: (performance.now() - started) / 1000, cpu: process.cpuUsage(cpu).user / 1e6, result };
}

function relativeRmsError(a: Float64Array, b: Float64Array): number {
  let e = 0;
  let s = 0;
  for (let i = 0; i < a.length; i++) {
    e += (a[i] - b[i]) ** 2;
    s += b[i] ** 2;
  }
  return Math.sqrt(e / s);
}

// The first render pays for the engine optimising the generated kernels (and for the odd trip back to
// unoptimised code while it learns their rarer branches); a re-render (a slider moved, the next run
// of a level search or tolerance study) does not. Both are timed; the figures below are the second.
const cold = timed(null, {});
const full = timed(null, {});
const r = full.result.report;
const duration = r.durationSeconds;
const solver = r.solver;
const internalSamples = solver.receiverSteps / DEFAULT_SUBSTEPS.receiver;
console.log(`scenario: ${scenarioFile} (${scenario.title ?? 'untitled'}), clip ${duration.toFixed(2)} s, internal rate ${solver.internalRateHertz / 1000} kHz`);
console.log(`first render in this process (engine not yet warm): ${cold.wall.toFixed(2)} s wall, real-time factor ${(duration / cold.wall).toFixed(2)}`);
console.log(`fast path, rendered again: ${full.wall.toFixed(2)} s wall, ${full.cpu.toFixed(2)} s CPU for ${duration.toFixed(2)} s of audio (CPU-time real-time factor ${(duration / full.cpu).toFixed(2)})`);
console.log(
  `time per integration step: transmitter ${((solver.transmitterSeconds / solver.transmitterSteps) * 1e6).toFixed(3)} µs (${DEFAULT_SUBSTEPS.transmitter} steps per internal sample), ` +
    `receiver ${((solver.receiverSeconds / solver.receiverSteps) * 1e6).toFixed(3)} µs (${DEFAULT_SUBSTEPS.receiver}); whole chain ${((full.wall / internalSamples) * 1e6).toFixed(3)} µs per internal sample`,
);
console.log(
  `Newton iterations per step: transmitter ${(solver.transmitterNewtonIterations / solver.transmitterSteps).toFixed(3)}, receiver ${(solver.receiverNewtonIterations / solver.receiverSteps).toFixed(3)}; ` +
    `${((100 * solver.generatedSteps) / (solver.transmitterSteps + solver.receiverSteps)).toFixed(2)} % of steps in the generated kernels (transmitter ${solver.transmitterKernel ?? 'none'}, receiver ${solver.receiverKernel ?? 'none'}); ` +
    `steps on a held linearisation: transmitter ${((100 * solver.transmitterReusedSteps) / solver.transmitterSteps).toFixed(1)} %, receiver ${((100 * solver.receiverReusedSteps) / solver.receiverSteps).toFixed(1)} %`,
);

// The ceiling of these kernels: the same clip so quiet that the link carries little but its own noise,
// so that nearly every step is solved on a held linearisation and Newton hardly ever runs.
const quietScenario = { ...scenario, source: { ...scenario.source, level: { kind: 'spl' as const, dbSpl: 10 } } };
const quietStarted = performance.now();
const quiet = renderScenario(quietScenario, { recording }).report.solver;
const quietWall = (performance.now() - quietStarted) / 1000;
console.log(
  `the same clip at 10 dB SPL (nearly every step on a held linearisation: transmitter ${((100 * quiet.transmitterReusedSteps) / quiet.transmitterSteps).toFixed(1)} %, ` +
    `receiver ${((100 * quiet.receiverReusedSteps) / quiet.receiverSteps).toFixed(1)} %): ${quietWall.toFixed(2)} s wall, real-time factor ${(duration / quietWall).toFixed(2)}`,
);

const excerpt = 2;
const fast = timed(excerpt, {});
const referenceSubsteps = { transmitter: 8 * DEFAULT_SUBSTEPS.transmitter, receiver: 8 * DEFAULT_SUBSTEPS.receiver };
const reference = timed(excerpt, { solver: { substeps: referenceSubsteps, tolerances: TIGHT_TOLERANCES } });
console.log(
  `accuracy (${excerpt} s excerpt): far end vs reference (8× smaller steps: ${referenceSubsteps.transmitter} and ${referenceSubsteps.receiver} per internal sample, tight Newton): ` +
    `${relativeRmsError(fast.result.farEndVolts, reference.result.farEndVolts).toExponential(3)} relative rms`,
);
timed(excerpt, { solver: { kernelBackend: 'js' } }); // warms the JavaScript kernels up, as the renders above did the WebAssembly ones
const javascript = timed(excerpt, { solver: { kernelBackend: 'js' } });
console.log(`the same kernels run as JavaScript instead of WebAssembly (both warm): ${javascript.wall.toFixed(2)} s vs ${fast.wall.toFixed(2)} s on ${excerpt} s`);
const straightforward = timed(excerpt, { solver: { linearAlgebra: 'dense' } });
console.log(`straightforward path (dense elimination each iteration): ${straightforward.wall.toFixed(2)} s vs fast ${fast.wall.toFixed(2)} s on ${excerpt} s: ratio ${(straightforward.wall / fast.wall).toFixed(2)}×`);
console.log(`peak resident memory: ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB (this process, all runs above)`);
// The whole machine as a user gets it: `glowtalk render` (the launcher's bundle) runs the receiver in
// its own thread and the transmitter in a worker thread, streaming the light between them.
const outFolder = mkdtempSync(path.join(tmpdir(), 'glowtalk-bench-'));
const cliStarted = performance.now();
const cli = spawnSync(process.execPath, ['bin/glowtalk.mjs', 'render', scenarioFile, '--out', outFolder, '--workers', '2', '--no-progress'], { encoding: 'utf8' });
const cliWall = (performance.now() - cliStarted) / 1000;
if (cli.status === 0) {
  const pipeWall = (JSON.parse(readFileSync(path.join(outFolder, 'report.json'), 'utf8')) as { solver: { wallSeconds: number } }).solver.wallSeconds;
  console.log(
    `whole machine, glowtalk render with the transmitter and receiver pipelined on two threads: ${pipeWall.toFixed(2)} s wall, real-time factor ${(duration / pipeWall).toFixed(2)} ` +
      `(${cliWall.toFixed(2)} s for the whole command: start, reading and writing files)`,
  );
} else console.log(`whole machine: glowtalk render failed: ${cli.stderr.trim()}`);
rmSync(outFolder, { recursive: true, force: true });
// Constant memory: a streamed one-minute render in a child process (bench:long runs 1, 10 and 60 minutes).
const long = spawnSync(process.execPath, ['--import', 'tsx', 'bench/long-input.ts', '1'], { encoding: 'utf8' });
const minute = long.stdout.split('\n').find((line) => line.trim().startsWith('1 min'));
console.log(`streamed render of a one-minute recording (glowtalk render, child process): ${minute ? minute.trim().replace(/^1 min:\s*/, '') : `failed: ${long.stderr.trim().split('\n').pop()}`}; npm run bench:long for 10 and 60 minutes`);
console.log(`realtime-factor: ${(duration / full.wall).toFixed(2)}`);
