/** Test-only: runs the glowtalk command in-process with captured output. */
import { main } from '../../src/cli/main.ts';

export interface CliRun {
  code: number;
  out: string;
  err: string;
}

export async function runCli(argv: string[]): Promise<CliRun> {
  let out = '';
  let err = '';
  const code = await main(argv, { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}
