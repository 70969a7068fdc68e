/**
 * Measured acquisition and the sweep in the browser: the editor's Acquisition tab measures the figures
 * in the job worker with a progress bar and cancel and shows them beside the estimates; the simulation
 * panel sweeps the input out and back and reports where lock was lost and regained; a release cut from
 * the design carries the figures the server measured at the cut.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from './harness/build.ts';
import { launchBrowser, signIn, type Browser } from './harness/browser.ts';
import { choose, screenshot, textOf } from './harness/pageHelpers.ts';
import { startStack, type Stack } from './harness/stack.ts';

let stack: Stack;
let browser: Browser;

beforeAll(async () => {
  buildApp();
  stack = await startStack({ processes: 2, balancer: 'nginx' });
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await stack?.stop();
});

async function openMains(): Promise<Page> {
  await browser.context.clearCookies();
  const page = await browser.newPage();
  await signIn(page, stack.baseUrl, 'designer@example.test');
  await page.goto(`${stack.baseUrl}/projects`);
  await page.click('a.design:has-text("Mains sync PI loop")');
  await page.waitForSelector('[data-test="analysis-status"]:has-text("up to date")', { timeout: 30_000 });
  return page;
}

describe('acquisition and sweep in the browser', () => {
  it('measures acquisition with a progress bar, cancels, and shows estimate and measured with their definitions', async () => {
    const page = await openMains();
    await page.click('#tab-acquisition');
    await page.waitForSelector('[data-test="run-acquisition"]');

    // The search takes a fraction of a second, so the page itself presses Cancel the moment the
    // progress bar appears (a person could not be quicker than the search).
    await page.evaluate(() => {
      const observer = new MutationObserver(() => {
        const cancel = document.querySelector<HTMLButtonElement>('[data-test="cancel-acquisition"]');
        if (document.querySelector('[data-test="acquisition-progress"]') && cancel) {
          observer.disconnect();
          cancel.click();
        }
      });
      observer.observe(document.body, { childList: true, subtree: true });
    });
    await page.click('[data-test="run-acquisition"]');
    await page.waitForSelector('[data-test="acquisition-cancelled"]');
    expect(await page.isVisible('[data-test="acquisition-result"]')).toBe(false);

    // Run to the end, recording every percentage the bar shows on the way.
    await page.evaluate(() => {
      const seen: string[] = [];
      (window as unknown as { acquisitionProgress: string[] }).acquisitionProgress = seen;
      new MutationObserver(() => {
        const text = document.querySelector('[data-test="acquisition-progress"]')?.textContent?.trim();
        if (text && seen.at(-1) !== text) seen.push(text);
      }).observe(document.body, { childList: true, subtree: true, characterData: true });
    });
    await page.click('[data-test="run-acquisition"]');
    await page.waitForSelector('[data-test="acquisition-result"]', { timeout: 60_000 });
    const seen = await page.evaluate(() => (window as unknown as { acquisitionProgress: string[] }).acquisitionProgress);
    expect(seen.length).toBeGreaterThan(0);

    // 2ζωn/2π = 2·0.707·5 Hz for the PI targets (G3, B6), beside the measured lock-in.
    expect(await textOf(page, '[data-test="acq-estimate-lockInHz"]')).toBe('7.07 Hz');
    expect(await textOf(page, '[data-test="acq-measured-lockInHz"]')).toMatch(/^1\d\.\d+ Hz$/);
    // Ideal PI: no hold-in formula; the search stops at the control word's range and says so.
    expect(await textOf(page, '[data-test="acq-measured-holdInHz"]')).toMatch(/^≥ 20/);
    expect(await textOf(page, '[data-test="acq-limit-holdInHz"]')).toMatch(/control word’s range/);
    const table = await textOf(page, '[data-test="acquisition-result"]');
    expect(table).toContain('without a cycle slip');
    expect(table).toContain('up to 2x');
    await screenshot(page, '20-editor-acquisition');
    await page.close();
  });

  it('sweeps the input out and back: the float PI loop holds, the bit-true loop loses lock inside its control range and regains it', async () => {
    const page = await openMains();
    await page.click('#tab-simulation');
    await choose(page, 'scenario-kind', 'Sweep out and back');
    await page.fill('input[data-test="scenario-fromHz"]', '0');
    await page.fill('input[data-test="scenario-toHz"]', '30');
    await page.fill('input[data-test="scenario-rateHzPerS"]', '5');
    await page.fill('input[data-test="scenario-durationS"]', '14');
    await page.click('[data-test="run-simulation"]');
    await page.waitForSelector('[data-test="trace-chart"] canvas', { timeout: 120_000 });
    expect(await textOf(page, '[data-test="metric-sweep-lost"] td:nth-child(2)')).toBe('held to the turn');
    const lost = await textOf(page, '[data-test="metric-sweep-lost"] td:nth-child(3)');
    expect(lost).toMatch(/^1\d(\.\d+)? Hz at /);
    expect(await textOf(page, '[data-test="metric-sweep-regained"] td:nth-child(3)')).toMatch(/Hz at /);
    await screenshot(page, '21-editor-sweep');
    await page.close();
  });

  it('cuts a release whose page shows the acquisition figures the server measured at the cut', async () => {
    const page = await openMains();
    await page.click('text=Releases');
    await page.waitForSelector('[data-test="cut-release"]');
    await page.click('[data-test="cut-release"]');
    await page.waitForSelector('[data-test="state-v1"]', { timeout: 60_000 });
    await page.waitForSelector('[data-test="release-acquisition"]', { timeout: 30_000 });
    expect(await textOf(page, '[data-test="release-acquisition"] [data-test="acq-estimate-lockInHz"]')).toBe('7.07 Hz');
    expect(await textOf(page, '[data-test="release-acquisition"] [data-test="acq-measured-holdInHz"]')).toMatch(/^≥ 20/);
    await screenshot(page, '22-release-acquisition');
    await page.close();
  });
});
