/**
 * The command line as one bundle of its TypeScript sources, built with esbuild and kept in a
 * cache folder until a source it was made from changes. Node loads it in about a third of the
 * time it takes through tsx's loader, which compiles and resolves each of some 150 modules
 * at every start (and again in every worker thread a render starts).
 *
 * The bundle's first line records what it was built from (each input's size and modification
 * time, and esbuild's version); a bundle whose record no longer matches is built again. It is
 * written under a temporary name and renamed, so two processes starting at once each see a
 * whole file. The packages the sources import are bundled too: loading zod's many modules one by
 * one cost more than parsing them in one file (import 77–92 ms against 109–182 ms).
 */
import { mkdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import * as path from 'node:path';

const RECORD = '// glowtalk-bundle ';
/** Bumped when the way the bundle is built changes, so that older bundles are built again. */
const FORMAT = 2;

/**
 * The path of an up-to-date bundle of `entry` (an absolute path) in `cacheFolder`, building it
 * when there is none or its sources have changed; null when it cannot be built or written (a
 * read-only install, no esbuild): the caller then runs the sources through tsx.
 */
export async function cliBundle(entry, cacheFolder) {
  const file = path.join(cacheFolder, `${path.basename(entry).replace(/\.[cm]?ts$/, '')}.mjs`);
  const entryFolder = path.dirname(entry);
  let esbuild;
  try {
    esbuild = await import('esbuild');
  } catch {
    return null;
  }
  if (isCurrent(file, entryFolder, esbuild.version)) return file;
  try {
    const startedMs = Date.now();
    const result = await esbuild.build({
      entryPoints: [entry],
      absWorkingDir: entryFolder,
      bundle: true,
      platform: 'node',
      format: 'esm',
      target: 'node20',
      keepNames: true,
      // The CommonJS packages bundled (commander, cli-progress) call require for Node's own modules.
      banner: { js: "import { createRequire as bundleRequire } from 'node:module'; const require = bundleRequire(import.meta.url);" },
      write: false,
      metafile: true,
      logLevel: 'silent',
    });
    // A source saved while esbuild ran may be in the bundle as it was before: record no time for
    // it, so that the next start builds again.
    const inputs = Object.keys(result.metafile.inputs).map((input) => {
      const stats = statSync(path.resolve(entryFolder, input));
      return [input, stats.size, stats.mtimeMs < startedMs - 1 ? stats.mtimeMs : -1];
    });
    const record = JSON.stringify({ format: FORMAT, esbuild: esbuild.version, inputs });
    mkdirSync(cacheFolder, { recursive: true });
    const temporary = `${file}.${process.pid}.tmp`;
    writeFileSync(temporary, `${RECORD}${record}\n${result.outputFiles[0].text}`);
    try {
      renameSync(temporary, file);
    } catch (error) {
      rmSync(temporary, { force: true });
      throw error;
    }
    return file;
  } catch {
    return null;
  }
}

/** The bundle exists and every input it records (relative to `entryFolder`) still has its recorded size and time. */
function isCurrent(file, entryFolder, esbuildVersion) {
  let text;
  try {
    text = readFileSync(file, 'utf8');
  } catch {
    return false;
  }
  if (!text.startsWith(RECORD)) return false;
  let record;
  try {
    record = JSON.parse(text.slice(RECORD.length, text.indexOf('\n')));
  } catch {
    return false;
  }
  if (record.format !== FORMAT || record.esbuild !== esbuildVersion || !Array.isArray(record.inputs) || record.inputs.length === 0) return false;
  for (const [input, size, mtimeMs] of record.inputs) {
    try {
      const stats = statSync(path.resolve(entryFolder, input));
      if (stats.size !== size || stats.mtimeMs !== mtimeMs) return false;
    } catch {
      return false;
    }
  }
  return true;
}
