import { Command, CommanderError } from 'commander';
import { isUserFacing } from '../errors.ts';
import { runBias } from './bias.ts';
import { runRender, type RenderFlags } from './render.ts';
import { runTransientCommand, type TransientFlags } from './transient.ts';
import { runCompareCommand, type CompareFlags } from './compare.ts';
import { runHeadroom, type HeadroomFlags } from './headroom.ts';
import { runResponseCommand, type ResponseFlags } from './response.ts';
import { runSweepCommand, type SweepFlags } from './sweep.ts';
import { runToleranceCommand, type ToleranceFlags } from './tolerance.ts';

const collect = (value: string, previous: string[] = []): string[] => [...previous, value];

/**
 * The `glowtalk` command. Returns the exit code: 0 done, 2 bad input (a
 * one-line message naming what is wrong), 3 the solver could not converge,
 * 1 an internal error (a bug in glowtalk).
 */
export async function main(argv: string[], io = defaultIo()): Promise<number> {
  const program = new Command('glowtalk')
    .description('Simulate an analog optical audio link: voice in, light across, speaker out.')
    .exitOverride()
    .configureOutput({ writeOut: io.out, writeErr: () => {}, outputError: () => {} })
    .showHelpAfterError(false);

  program
    .command('bias')
    .argument('<circuit>', 'circuit file (glowtalk.circuit/1 JSON)')
    .description('print the DC operating point as JSON')
    .action((file: string) => runBias(file, io.out));

  program
    .command('transient')
    .argument('<circuit>', 'circuit file (glowtalk.circuit/1 JSON)')
    .description('simulate over time and write the probes as CSV')
    .requiredOption('--stop <seconds>', 'end time, e.g. 10m')
    .requiredOption('--step <seconds>', 'output interval (and step in fixed mode), e.g. 10u')
    .option('--probe <name>', 'node name, part ref or REF.PIN (repeatable; default: every node)', collect)
    .option('--csv <file>', 'write the CSV here instead of standard output')
    .option('--method <rule>', 'integration rule: tr (trapezoidal) or bdf2', 'tr')
    .option('--steps <mode>', 'adaptive (error-controlled) or fixed', 'adaptive')
    .action((file: string, flags: TransientFlags) => runTransientCommand(file, flags, io.out));

  program
    .command('render')
    .argument('<scenario>', 'scenario file (glowtalk.scenario/1 JSON)')
    .description('run the whole link; write the far-end WAV, tap WAVs and report.json')
    .option('--input <wav>', 'use this recording as the source (level from the scenario)')
    .option('--out <dir>', 'output folder (default out/<scenario name>)')
    .option('--tap <name>', 'capture a signal, e.g. transmitter.led or receiver.Q2.collector (repeatable)', collect)
    .option('--format <format>', 'far-end WAV format: pcm16 or float32')
    .option('--spl <dB>', 'talker level at the microphone in dB SPL (overrides the scenario)')
    .option('--effort <effort>', 'vocal effort: normal, raised, loud or shout (with --distance)')
    .option('--distance <metres>', 'talker distance from the microphone, e.g. 0.3')
    .option('--workers <n>', 'threads: 2 runs the transmitter and the receiver side by side (default on 2+ cores), 1 runs them in turn')
    .option('--no-progress', 'no progress bar')
    .action((file: string, flags: RenderFlags) => runRender(file, flags, io.out));

  program
    .command('headroom')
    .argument('<scenario>', 'scenario file (glowtalk.scenario/1 JSON)')
    .description('find the levels at which the LED cuts off, THD reaches 1/3/10 % and STOI falls')
    .option('--tolerance <dB>', 'each level within ± this (default 0.25)')
    .option('--tone <hertz>', 'test tone frequency (default 1000)')
    .option('--tone-seconds <seconds>', 'length of each tone render (default 0.3)')
    .option('--thd <percents>', 'THD levels to find, comma-separated (default 1,3,10)')
    .option('--stoi-below <value>', 'STOI that counts as failing speech (default 0.8)')
    .option('--speech-seconds <seconds>', 'length of each speech render (default 1)')
    .option('--no-speech', 'skip the STOI search')
    .option('--from <dB>', 'level where the searches start (default the scenario\'s)')
    .option('--input <wav>', 'speech recording for the STOI search')
    .option('--workers <n>', 'worker threads (default: all cores; 0 = none)')
    .option('--out <dir>', 'output folder (default out/<scenario name>-headroom)')
    .option('--no-progress', 'no progress bar')
    .action((file: string, flags: HeadroomFlags) => runHeadroom(file, flags, io.out));

  program
    .command('sweep')
    .argument('<scenario>', 'scenario file (glowtalk.scenario/1 JSON)')
    .description('step settings over a range and tabulate the link\'s figures at each step')
    .option('--set <path=from:to:steps>', 'setting to step by its path in the file, or "level" (dB SPL), e.g. level=60:100:9 (repeatable: a grid; add :log for log steps)', collect)
    .option('--log', 'logarithmic steps for every --set')
    .option('--metrics <names>', 'comma-separated: restingLedMilliamperes, minLedMilliamperes, cutoffFraction, cutoffCount, farEndDbv, thdPercent, sinadDb, stoi, snrDb, segSnrDb')
    .option('--seconds <seconds>', 'length of each render, or "all" (default 0.3 for test signals, 1 for speech)')
    .option('--spl <dB>', 'talker level at the microphone in dB SPL (overrides the scenario)')
    .option('--tone <hertz>', 'use a steady tone at the scenario\'s level as the source (for THD and SINAD)')
    .option('--input <wav>', 'use this recording as the source (level from the scenario)')
    .option('--workers <n>', 'worker threads (default: all cores; 0 = none)')
    .option('--out <dir>', 'output folder (default out/<scenario name>-sweep)')
    .option('--no-progress', 'no progress bar')
    .action((file: string, flags: SweepFlags) => runSweepCommand(file, flags, io.out));

  program
    .command('tolerance')
    .argument('<scenario>', 'scenario file (glowtalk.scenario/1 JSON)')
    .description('Monte Carlo over part tolerances: spread and worst cases of the link\'s figures')
    .option('--runs <n>', 'Monte Carlo runs (default 100)')
    .option('--seed <n>', 'seed; each run depends only on the seed and its index (default 1)')
    .option('--corners', 'also run every part at its low end, and at its high end')
    .option('--resistors <percent>', 'resistor tolerance, ± percent (default 5)')
    .option('--capacitors <percent>', 'capacitor tolerance, ± percent (default 10)')
    .option('--beta <min:max>', 'current gain range of NPN/PNP transistors, e.g. 100:300')
    .option('--photo-beta <min:max>', 'current gain range of phototransistors')
    .option('--led-vf <volts>', 'LED forward-voltage spread, ± volts (default 0)')
    .option('--efficiency <percent>', 'LED emitter efficiency, ± percent (default 0)')
    .option('--distribution <kind>', 'uniform (default) or normal (range = ±3σ)')
    .option('--fixed <refs>', 'parts kept nominal, comma-separated, e.g. R1,transmitter.R3')
    .option('--metrics <names>', 'comma-separated metric names (see glowtalk sweep --help)')
    .option('--seconds <seconds>', 'length of each render, or "all" (default 0.3 for test signals, 1 for speech)')
    .option('--spl <dB>', 'talker level at the microphone in dB SPL (overrides the scenario)')
    .option('--tone <hertz>', 'use a steady tone at the scenario\'s level as the source (for THD and SINAD)')
    .option('--input <wav>', 'use this recording as the source (level from the scenario)')
    .option('--workers <n>', 'worker threads (default: all cores; 0 = none)')
    .option('--out <dir>', 'output folder (default out/<scenario name>-tolerance)')
    .option('--no-progress', 'no progress bar')
    .action((file: string, flags: ToleranceFlags) => runToleranceCommand(file, flags, io.out));

  program
    .command('response')
    .argument('<scenario>', 'scenario file (glowtalk.scenario/1 JSON)')
    .description('frequency response and harmonics of the whole link from one swept sine')
    .option('--from <hertz>', 'sweep start (default 20)')
    .option('--to <hertz>', 'sweep end (default 20000)')
    .option('--seconds <seconds>', 'sweep length (default 2)')
    .option('--harmonics <n>', 'highest harmonic reported (default 3)')
    .option('--spl <dB>', 'sweep level at the microphone in dB SPL (default the scenario\'s)')
    .option('--points-per-octave <n>', 'rows per octave in the table (default 12)')
    .option('--out <dir>', 'output folder (default out/<scenario name>-response)')
    .option('--no-progress', 'no progress bar')
    .action((file: string, flags: ResponseFlags) => runResponseCommand(file, flags, io.out));

  program
    .command('compare')
    .argument('<reference>', 'reference WAV (e.g. the clean source)')
    .argument('<other>', 'WAV to compare with it (e.g. the far end)')
    .description('align two recordings; report STOI, SNRs, levels and third-octave differences')
    .option('--max-lag <seconds>', 'largest delay searched either way (default 0.5)')
    .option('--out <dir>', 'output folder (default out/<other name>-compare)')
    .action((reference: string, other: string, flags: CompareFlags) => runCompareCommand(reference, other, flags, io.out));

  try {
    await program.parseAsync(argv, { from: 'user' });
    return 0;
  } catch (error) {
    if (error instanceof CommanderError) {
      if (error.exitCode === 0) return 0;
      io.err(`glowtalk: ${error.message.replace(/^error: /, '')}\n`);
      return 2;
    }
    if (isUserFacing(error)) {
      io.err(`glowtalk: ${error.message}\n`);
      return error.name === 'ConvergenceError' ? 3 : 2;
    }
    const message = error instanceof Error ? error.message : String(error);
    io.err(`glowtalk: internal error: ${message} (please report this with the input that caused it)\n`);
    if (process.env.GLOWTALK_DEBUG) io.err(`${(error as Error).stack}\n`);
    return 1;
  }
}

export interface Io {
  out: (text: string) => void;
  err: (text: string) => void;
}

function defaultIo(): Io {
  return { out: (t) => void process.stdout.write(t), err: (t) => void process.stderr.write(t) };
}
