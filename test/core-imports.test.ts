import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

/** Every core module: src/ without the command line, the Node shells in src/worker and the Web Worker's entry. */
function coreModules(dir = 'src'): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return path === join('src', 'cli') ? [] : coreModules(path);
    if (!name.endsWith('.ts') || (dir === join('src', 'worker') && (name.startsWith('node-') || name === 'render-worker.ts'))) return [];
    return [path];
  });
}

describe('the core', () => {
  const modules = coreModules();

  it('imports no Node module and touches no DOM, so it runs in the page, a Worker and Node alike', () => {
    expect(modules.length).toBeGreaterThan(50);
    for (const path of modules) {
      const text = readFileSync(path, 'utf8');
      expect([path, /from ['"]node:|require\(/.test(text)]).toEqual([path, false]);
      expect([path, /\bdocument\.|\blocalStorage\.|\bwindow\.(location|document|addEventListener)/.test(text)]).toEqual([path, false]);
    }
  });

  it('loads every module in Node with no DOM present', async () => {
    expect(typeof (globalThis as { document?: unknown }).document).toBe('undefined');
    const loaders = import.meta.glob(['../src/**/*.ts', '!../src/cli/**', '!../src/worker/node-*.ts', '!../src/worker/render-worker.ts']);
    expect(Object.keys(loaders).length).toBe(modules.length);
    for (const [path, load] of Object.entries(loaders)) {
      const module = await load();
      expect([path, typeof module]).toEqual([path, 'object']);
    }
  });
});
