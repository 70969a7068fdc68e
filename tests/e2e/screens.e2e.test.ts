/**
 * What a person reads on each screen, in Debian's Chromium: the editor, release and review pages at
 * 1280, 1440 and 1920 px wide hold their content (no box wider than itself, so nothing is cut off), with
 * a screenshot of each; the signed-out sign-in page asks the server nothing that fails; the not-found
 * page keeps the rail; card titles read as written; a filter switch fills its new fields; a field's
 * message stays inside its field.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from './harness/build.ts';
import { launchBrowser, signIn, type Browser } from './harness/browser.ts';
import { choose, screenshot, textOf } from './harness/pageHelpers.ts';
import { api, apiSignIn } from './harness/api.ts';
import { startStack, type Stack } from './harness/stack.ts';

let stack: Stack;
let browser: Browser;
const fixture = { designId: 0, releaseId: 0, reviewLink: '' };

const WIDTHS = [1280, 1440, 1920] as const;

beforeAll(async () => {
  buildApp();
  stack = await startStack({ processes: 1, balancer: 'none' });
  browser = await launchBrowser();
  // A release of the mains demo in review, cut and sent through the API (the browser flow is flow.e2e's).
  const { cookie } = await apiSignIn(stack.baseUrl, 'designer@example.test');
  const projects = await api<{ projects: { id: number }[] }>(stack.baseUrl, '/api/projects', { cookie });
  for (const p of projects.body.projects) {
    const designs = await api<{ designs: { id: number; name: string }[] }>(stack.baseUrl, `/api/projects/${p.id}/designs`, { cookie });
    const mains = designs.body.designs.find((d) => d.name === 'Mains sync PI loop');
    if (mains) fixture.designId = mains.id;
  }
  expect(fixture.designId).toBeGreaterThan(0);
  const cut = await api<{ id: number }>(stack.baseUrl, `/api/designs/${fixture.designId}/releases`, { cookie, method: 'POST', json: {} });
  expect(cut.status).toBe(201);
  fixture.releaseId = cut.body.id;
  const reviewers = await api<{ reviewers: { id: number; email: string }[] }>(stack.baseUrl, '/api/reviewers', { cookie });
  const robin = reviewers.body.reviewers.find((r) => r.email === 'reviewer@example.test')!;
  const asked = await api(stack.baseUrl, `/api/releases/${fixture.releaseId}/reviews`, { cookie, json: { reviewerIds: [robin.id], approvalsRequired: 1 } });
  expect(asked.status).toBeLessThan(300);
  const mail = await stack.mail.waitFor((m) => m.to.includes('reviewer@example.test'), 120_000);
  fixture.reviewLink = new RegExp(`${stack.baseUrl.replace(/[.:/]/g, '\\$&')}/review/[^\\s"'<>]+`).exec(mail.text)![0];
});

afterAll(async () => {
  await browser?.close();
  await stack?.stop();
});

async function freshPage(width = 1280): Promise<Page> {
  await browser.context.clearCookies();
  const page = await browser.newPage();
  await page.setViewportSize({ width, height: 1000 });
  return page;
}

/**
 * Every visible box on the page that is wider inside than out (its content runs past its right edge,
 * so a part is cut off or needs a sideways scroll), and the page itself. Element Plus tables scroll
 * their own bodies by design and are left out.
 */
async function overflowing(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = [];
    if (document.documentElement.scrollWidth > window.innerWidth + 1) out.push(`page ${document.documentElement.scrollWidth} > ${window.innerWidth}`);
    for (const el of document.querySelectorAll<HTMLElement>('main, section, aside, .lw-card, .lw-page, .lw-plot-side, .results, table')) {
      if (el.offsetParent === null || el.closest('.el-table')) continue;
      if (el.scrollWidth > el.clientWidth + 1) {
        const name = el.getAttribute('data-test') ?? el.getAttribute('aria-label') ?? el.className;
        out.push(`${el.tagName.toLowerCase()} "${name}": content ${el.scrollWidth} px in a ${el.clientWidth} px box`);
      }
    }
    return out;
  });
}

describe('screens as a person reads them', () => {
  it('loads the signed-out sign-in page without a failed request or a console error', async () => {
    const page = await freshPage();
    const errors: string[] = [];
    page.on('console', (msg) => {
      if (msg.type() === 'error') errors.push(msg.text());
    });
    page.on('response', (r) => {
      if (r.status() >= 400) errors.push(`${r.status()} ${r.url()}`);
    });
    await page.goto(`${stack.baseUrl}/sign-in`);
    await page.waitForSelector('input[data-test="email"]');
    await page.reload();
    await page.waitForSelector('input[data-test="email"]');
    await page.waitForTimeout(500);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('keeps the navigation on the not-found page for a signed-in person', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'designer@example.test');
    await page.goto(`${stack.baseUrl}/no-such-screen`);
    await page.waitForSelector('text=Nothing here');
    const nav = (await page.locator('nav[aria-label="Main"] li a').allTextContents()).map((t) => t.trim());
    expect(nav).toEqual(['Projects', 'Downloads', 'Conformance']);
    await screenshot(page, 'screens-not-found');
    await page.close();
  });

  for (const width of WIDTHS) {
    it(`holds the editor's columns at ${width} px: nothing cut off, the Bode title as written`, async () => {
      const page = await freshPage(width);
      await signIn(page, stack.baseUrl, 'designer@example.test');
      await page.goto(`${stack.baseUrl}/designs/${fixture.designId}`);
      await page.waitForSelector('[data-test="bode-chart"] canvas', { timeout: 30_000 });
      await page.waitForSelector('[data-test="analysis-status"]:has-text("up to date")');
      await page.waitForSelector('[data-test="row-stability"]');
      // innerText applies CSS text-transform: what the eye reads.
      expect(await page.locator('section[aria-label="Open-loop Bode plot"] h3').innerText()).toBe('Open loop, L(f)');
      expect(await overflowing(page)).toEqual([]);
      // The figures column ends inside the results column (the 1440 px fault: 915 px of content in 844 px).
      const inside = await page.evaluate(() => {
        const results = document.querySelector('.results')!.getBoundingClientRect();
        return [...document.querySelectorAll('section[aria-label="Margins and ranges"] .lw-card')].every((c) => c.getBoundingClientRect().right <= results.right + 1);
      });
      expect(inside).toBe(true);
      await screenshot(page, `screens-editor-${width}`);
      await page.close();
    });
  }

  it('fills the time constants when "set by" switches, and keeps a message inside its field', async () => {
    const page = await freshPage(1440);
    await signIn(page, stack.baseUrl, 'designer@example.test');
    await page.goto(`${stack.baseUrl}/designs/${fixture.designId}`);
    await page.waitForSelector('[data-test="analysis-status"]:has-text("up to date")');
    await choose(page, 'filter-mode', 'Time constants τ1, τ2');
    // τ1 = K/ωn² = 62.832/(2π·5)² = 0.063662 s, τ2 = 2ζ/ωn = 0.045009 s (G3 Ch. 2; the app's filterSwitch test).
    expect(Number(await page.inputValue('input[data-test="filter-tau1-s"]'))).toBeCloseTo(0.063662, 5);
    expect(Number(await page.inputValue('input[data-test="filter-tau2-s"]'))).toBeCloseTo(0.045009, 5);
    expect(await page.locator('.spec-form .el-form-item__error').count()).toBe(0);

    await page.fill('input[data-test="fixed-point-accumulator-bits"]', '3');
    const error = page.locator('input[data-test="fixed-point-accumulator-bits"] >> xpath=ancestor::div[contains(@class,"el-form-item")][1]//div[contains(@class,"el-form-item__error")]');
    await error.waitFor();
    expect(await error.innerText()).toMatch(/^Accumulator width .* bits?\b.*\.$/);
    const fits = await error.evaluate((el) => {
      const item = el.closest('.el-form-item')!.getBoundingClientRect();
      const box = el.getBoundingClientRect();
      return box.left >= item.left - 1 && box.right <= item.right + 1 && box.bottom <= item.bottom + 1;
    });
    expect(fits).toBe(true);
    await screenshot(page, 'screens-editor-field-message');
    await page.close();
  });

  for (const width of WIDTHS) {
    it(`holds the release page at ${width} px`, async () => {
      const page = await freshPage(width);
      await signIn(page, stack.baseUrl, 'designer@example.test');
      await page.goto(`${stack.baseUrl}/designs/${fixture.designId}/releases`);
      await page.click('[data-test="state-v1"]');
      await page.waitForSelector('[data-test="release-detail"] [data-test="bode-chart"] canvas', { timeout: 30_000 });
      expect(await overflowing(page)).toEqual([]);
      await screenshot(page, `screens-release-${width}`);
      await page.close();
    });
  }

  for (const width of WIDTHS) {
    it(`holds the review page at ${width} px`, async () => {
      const page = await freshPage(width);
      await page.goto(fixture.reviewLink);
      await page.waitForSelector('[data-test="bode-chart"] canvas', { timeout: 30_000 });
      expect(await textOf(page, 'h1')).not.toBe('');
      expect(await overflowing(page)).toEqual([]);
      await screenshot(page, `screens-review-${width}`);
      await page.close();
    });
  }
});
