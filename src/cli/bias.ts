import { parseCircuitText } from '../circuit/index.ts';
import { biasPoint } from '../solver/bias-report.ts';
import { readFileText } from './files.ts';

/** `glowtalk bias FILE`: the DC operating point as JSON on standard output. */
export function runBias(file: string, write: (text: string) => void): void {
  const circuit = parseCircuitText(readFileText(file, 'circuit'), file);
  const report = biasPoint(circuit);
  write(`${JSON.stringify({ nodes: report.nodes, parts: report.parts }, null, 2)}\n`);
}
