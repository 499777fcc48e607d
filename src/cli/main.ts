import { Command, CommanderError } from 'commander';
import { isUserFacing } from '../errors.ts';
import { runBias } from './bias.ts';
import { runRender, type RenderFlags } from './render.ts';
import { runTransientCommand, type TransientFlags } from './transient.ts';

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
    .option('--no-progress', 'no progress bar')
    .action((file: string, flags: RenderFlags) => runRender(file, flags, io.out));

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
