#!/usr/bin/env node
// Launcher: registers the TypeScript loader, then hands over to the CLI entry.
import { register } from 'tsx/esm/api';
register();
const { main } = await import('../src/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
