#!/usr/bin/env node
// Launcher: runs the command line from a bundle of its sources kept up to date in
// node_modules/.cache/glowtalk (cli-bundle.mjs), or through tsx's loader where the bundle
// cannot be built or written, and when GLOWTALK_DEBUG asks for stack traces that name the sources.
import * as path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { cliBundle } from './cli-bundle.mjs';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const bundle = process.env.GLOWTALK_DEBUG ? null : await cliBundle(path.join(root, 'src/cli/main.ts'), path.join(root, 'node_modules/.cache/glowtalk'));
let main;
if (bundle) {
  ({ main } = await import(pathToFileURL(bundle).href));
} else {
  const { register } = await import('tsx/esm/api');
  register();
  ({ main } = await import('../src/cli/main.ts'));
}
process.exitCode = await main(process.argv.slice(2));
