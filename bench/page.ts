/**
 * `npm run bench:page`: demo (a) in the workbench page in Chromium (the browser tests' harness:
 * a production build, vite preview, Debian's chromium). Renders the default excerpt on load,
 * then the whole 11 s clip three times, and prints the page's own figure for each ("last: … in
 * … s"). The browser's engine treats the generated kernels differently from Node's — a kernel
 * change that speeds up `npm run bench` can slow the page several-fold — so run both.
 */
import { startBench } from '../test/e2e/harness.ts';

const bench = await startBench();
const page = bench.page;
const renders = async (): Promise<number> => Number((await page.locator('gt-workbench').getAttribute('data-renders')) ?? '0');
const renderedAfter = async (after: number): Promise<void> => {
  await page.waitForFunction(
    (n) => {
      const host = document.querySelector('gt-workbench');
      const state = host?.shadowRoot?.querySelector('gt-render-bar')?.shadowRoot?.querySelector('[data-render-state]')?.getAttribute('data-render-state');
      if (state === 'failed') throw new Error('the render failed');
      return Number(host?.getAttribute('data-renders') ?? '0') > n && state === 'idle';
    },
    after,
    { timeout: 300_000 },
  );
};
try {
  await page.goto(bench.url);
  await renderedAfter(0);
  console.log(`on load: ${await page.locator('[data-last-run]').innerText()}`);
  for (let r = 0; r < 3; r++) {
    // Alternate with a short excerpt so that each whole-clip render is a new one.
    for (const excerpt of ['0.5', 'all']) {
      const before = await renders();
      await page.locator('gt-render-bar [data-excerpt]').selectOption(excerpt);
      await renderedAfter(before);
    }
    console.log(`whole clip: ${await page.locator('[data-last-run]').innerText()} (${(await page.locator('gt-chain-strip [data-block="solver"] .sub').innerText()).trim()})`);
  }
} finally {
  await bench.close();
}
