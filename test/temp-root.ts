import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/**
 * Vitest global setup: every temporary folder made during a run (the tests' own, the CLI's in
 * its child processes, the browser's profile and build) goes under one folder, removed when the
 * run ends, so that runs leave nothing behind in the system's temporary folder.
 */
export default function setup(): () => void {
  const root = mkdtempSync(join(tmpdir(), 'glowtalk-tests-'));
  const previous = process.env.TMPDIR;
  process.env.TMPDIR = root;
  return () => {
    if (previous === undefined) delete process.env.TMPDIR;
    else process.env.TMPDIR = previous;
    rmSync(root, { recursive: true, force: true });
  };
}
