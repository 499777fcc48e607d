import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OUTPUT, startBench, type Bench } from './harness.ts';
import { join } from 'node:path';

// The Margins tab in its own short browser session (same harness as the workbench walk).
let bench: Bench;
let page: Page;

beforeAll(async () => {
  bench = await startBench();
  page = bench.page;
}, 180_000);

afterAll(async () => {
  await bench?.close();
});

describe('the Margins tab in Chromium', () => {
  it('runs a 3-level sweep of 0.2 s tone renders in the workers and draws THD against level with a table row per level', async () => {
    await page.goto(bench.url);
    await page.locator('gt-view-panel nav button[data-view="margins"]').click();
    const run = page.locator('gt-margins-panel [data-margins-run="sweep"]');
    await expect.poll(() => run.isEnabled(), { timeout: 30_000 }).toBe(true);
    await page.locator('gt-margins-panel input[data-sweep="fromDbSpl"]').fill('70');
    await page.locator('gt-margins-panel input[data-sweep="toDbSpl"]').fill('100');
    await page.locator('gt-margins-panel input[data-sweep="steps"]').fill('3');
    await page.locator('gt-margins-panel input[data-sweep="seconds"]').fill('0.2');
    const started = Date.now();
    await run.click();
    const handle = await page.waitForFunction(
      () => {
        const panel = document.querySelector('gt-workbench')?.shadowRoot?.querySelector('gt-view-panel')?.shadowRoot?.querySelector('gt-margins-panel')?.shadowRoot;
        const state = panel?.querySelector('[data-margins-state]')?.getAttribute('data-margins-state');
        const message = panel?.querySelector('[data-margins-message]')?.textContent ?? '';
        return state === 'done' || state === 'failed' || state === 'cancelled' ? `${state}: ${message}` : false;
      },
      undefined,
      { timeout: 20_000 },
    );
    const outcome = String(await handle.jsonValue());
    const seconds = (Date.now() - started) / 1000;
    await page.screenshot({ path: join(OUTPUT, 'margins-sweep.png'), fullPage: true });
    expect(outcome).toMatch(/^done: Level sweep: 3 renders in .* on [12] workers/);
    console.log(`margins sweep: ${outcome} (${seconds.toFixed(1)} s from the click)`);

    const rows = page.locator('gt-margins-panel [data-sweep-row]');
    await expect.poll(() => rows.count()).toBe(3);
    expect(await rows.first().locator('td').first().innerText()).toBe('70.0');
    // Every row measured THD (a number, not an error).
    for (let i = 0; i < 3; i++) expect(await rows.nth(i).locator('td').nth(1).innerText()).toMatch(/^\d+\.\d{3}$/);

    // The THD line is drawn: pixels of its colour (#7bd88f) on the plot's canvas.
    const canvas = page.locator('gt-margins-panel gt-margin-plot[data-sweep-plot] canvas');
    const green = await canvas.evaluate((element) => {
      const c = element as HTMLCanvasElement;
      const data = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
      let n = 0;
      for (let i = 0; i < data.length; i += 4) {
        if (data[i + 3] > 200 && Math.abs(data[i] - 0x7b) < 30 && Math.abs(data[i + 1] - 0xd8) < 30 && Math.abs(data[i + 2] - 0x8f) < 30) n++;
      }
      return n;
    });
    expect(green).toBeGreaterThan(50);
    expect(bench.errors).toEqual([]);
  }, 60_000);
});
