import { mkdtempSync, readFileSync, readdirSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import { cliBundle } from '../../bin/cli-bundle.mjs';

/** A two-module TypeScript program in a folder of its own. */
function program(value: number): { folder: string; entry: string; cache: string } {
  const folder = mkdtempSync(join(tmpdir(), 'glowtalk-bundle-'));
  writeFileSync(join(folder, 'part.ts'), `export const value: number = ${value};\n`);
  writeFileSync(join(folder, 'entry.ts'), `import { value } from './part.ts';\nexport const doubled = (): number => 2 * value;\n`);
  return { folder, entry: join(folder, 'entry.ts'), cache: join(folder, 'cache') };
}

let imports = 0;
async function load(file: string): Promise<{ doubled(): number }> {
  // A query of its own each time: the module cache would otherwise hand back the first load.
  return import(`${pathToFileURL(file).href}?load=${imports++}`);
}

describe('the command line bundle (bin/cli-bundle.mjs)', () => {
  it('bundles a TypeScript program into the cache folder and keeps the bundle while its sources stay the same', async () => {
    const { entry, cache } = program(21);
    const file = await cliBundle(entry, cache);
    expect(file).toBe(join(cache, 'entry.mjs'));
    expect((await load(file!)).doubled()).toBe(42);
    const built = statSync(file!).mtimeMs;
    const text = readFileSync(file!, 'utf8');
    expect(await cliBundle(entry, cache)).toBe(file);
    expect(statSync(file!).mtimeMs).toBe(built);
    expect(readFileSync(file!, 'utf8')).toBe(text);
    // Nothing else in the folder: no temporary file left behind.
    expect(readdirSync(cache)).toEqual(['entry.mjs']);
  });

  it('builds the bundle again when a module it was made from changes', async () => {
    const { folder, entry, cache } = program(21);
    await cliBundle(entry, cache);
    writeFileSync(join(folder, 'part.ts'), 'export const value: number = 100;\n');
    const file = await cliBundle(entry, cache);
    expect((await load(file!)).doubled()).toBe(200);
  });

  it('does not trust a source dated after the build began (saved while esbuild ran): the next call builds again', async () => {
    const { folder, entry, cache } = program(3);
    const soon = new Date(Date.now() + 60_000);
    utimesSync(join(folder, 'part.ts'), soon, soon);
    const file = (await cliBundle(entry, cache))!;
    expect((await load(file)).doubled()).toBe(6);
    const first = statSync(file).ino;
    // Nothing has changed since, but the source's time could not be vouched for.
    await cliBundle(entry, cache);
    expect(statSync(file).ino).not.toBe(first);
    // Once the source's time is before a build, that build is kept.
    const past = new Date(Date.now() - 60_000);
    utimesSync(join(folder, 'part.ts'), past, past);
    await cliBundle(entry, cache);
    const kept = statSync(file).ino;
    expect(await cliBundle(entry, cache)).toBe(file);
    expect(statSync(file).ino).toBe(kept);
  });

  it('builds the bundle again when its record of what it was made from is damaged', async () => {
    const { entry, cache } = program(5);
    const file = (await cliBundle(entry, cache))!;
    writeFileSync(file, '// glowtalk-bundle {"format":1,"inp\nexport const doubled = () => -1;\n');
    expect(await cliBundle(entry, cache)).toBe(file);
    expect((await load(file)).doubled()).toBe(10);
  });

  it('answers null, so that the launcher runs the sources through tsx, when the cache folder cannot be made', async () => {
    const { folder, entry } = program(1);
    const notAFolder = join(folder, 'part.ts');
    expect(await cliBundle(entry, join(notAFolder, 'cache'))).toBeNull();
    expect(readdirSync(folder).sort()).toEqual(['entry.ts', 'part.ts']);
  });

  it('answers null when the sources do not compile', async () => {
    const { folder, entry, cache } = program(1);
    writeFileSync(join(folder, 'part.ts'), 'export const value: number = ;\n');
    expect(await cliBundle(entry, cache)).toBeNull();
  });
});
