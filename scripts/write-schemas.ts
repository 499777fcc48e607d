/**
 * Writes the published JSON Schemas in schema/ from the zod schemas in src/.
 * Run: npx tsx scripts/write-schemas.ts   (a test checks the files are current)
 */
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { circuitJsonSchema } from '../src/circuit/schema.ts';
import { scenarioJsonSchema } from '../src/scenario/schema.ts';

/** Output file (relative to the repository root) -> generator. Add new formats here. */
export const SCHEMAS: ReadonlyArray<readonly [string, () => unknown]> = [
  ['schema/glowtalk.circuit.schema.json', circuitJsonSchema],
  // Refers to the circuit schema by the relative $ref "glowtalk.circuit.schema.json": keep both in schema/.
  ['schema/glowtalk.scenario.schema.json', scenarioJsonSchema],
];

/** The exact text committed for a schema: two-space JSON plus a final newline. */
export function schemaText(schema: unknown): string {
  return `${JSON.stringify(schema, null, 2)}\n`;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const root = new URL('../', import.meta.url);
  for (const [path, generate] of SCHEMAS) {
    writeFileSync(new URL(path, root), schemaText(generate()));
    console.log(`wrote ${path}`);
  }
}
