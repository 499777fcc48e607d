/**
 * Browser-test harness: builds the page with Vite into a temporary folder,
 * serves it with `vite preview` on a free localhost port, and drives Debian's
 * chromium with playwright-core. No mocks: the real worker, audio and
 * IndexedDB run in the browser.
 */
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { build, preview, type PreviewServer } from 'vite';

export const CHROMIUM = '/usr/bin/chromium';
export const REPO = resolve(import.meta.dirname, '../..');
export const OUTPUT = join(REPO, 'test-output');

/** Fails (never skips) when the browser is missing, saying how to get it. */
export function requireChromium(): void {
  if (!existsSync(CHROMIUM)) {
    throw new Error(
      `${CHROMIUM} is missing, so the browser tests cannot run. Install Debian's chromium: ` +
        '`bash scripts/ensure-chromium.sh` (or `apt-get update && apt-get install -y chromium` as root).',
    );
  }
}

function freePort(): Promise<number> {
  return new Promise((done, fail) => {
    const server = createServer();
    server.once('error', fail);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      server.close(() => done(port));
    });
  });
}

export interface Bench {
  url: string;
  context: BrowserContext;
  page: Page;
  /** Browser errors seen (page errors and console errors). */
  errors: string[];
  close(): Promise<void>;
}

export async function startBench(): Promise<Bench> {
  requireChromium();
  mkdirSync(OUTPUT, { recursive: true });
  const dist = mkdtempSync(join(tmpdir(), 'glowtalk-dist-'));
  const profile = mkdtempSync(join(tmpdir(), 'glowtalk-chromium-'));
  const configFile = join(REPO, 'vite.config.ts');
  await build({ root: REPO, configFile, logLevel: 'error', build: { outDir: dist, emptyOutDir: true, sourcemap: false } });
  const port = await freePort();
  const server: PreviewServer = await preview({
    root: REPO,
    configFile,
    logLevel: 'error',
    build: { outDir: dist },
    preview: { host: '127.0.0.1', port, strictPort: true, open: false },
  });
  const url = `http://127.0.0.1:${port}/`;
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    viewport: { width: 1500, height: 1000 },
    acceptDownloads: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const errors: string[] = [];
  page.on('pageerror', (error) => errors.push(`pageerror: ${error.message}`));
  page.on('console', (message) => {
    if (message.type() === 'error') errors.push(`console: ${message.text()}`);
  });
  return {
    url,
    context,
    page,
    errors,
    async close() {
      await context.close().catch(() => undefined);
      await new Promise<void>((done) => server.httpServer.close(() => done()));
      rmSync(dist, { recursive: true, force: true });
      rmSync(profile, { recursive: true, force: true });
    },
  };
}
