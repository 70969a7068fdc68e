/**
 * The demo data in the browser: the stack seeds the demo releases as `npm start` does (through the
 * running server: cuts, RTL verification, review mail, approval, firmware's downloads and conformance
 * uploads), then each role walks through them. Every plot added for the demo is screenshotted
 * (test-results/screenshots/demo-*.png) once it has drawn.
 */
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from './harness/build.ts';
import { launchBrowser, signIn, type Browser } from './harness/browser.ts';
import { screenshot, tableRows, textOf } from './harness/pageHelpers.ts';
import { SCREENSHOTS } from './harness/paths.ts';
import { startStack, type Stack } from './harness/stack.ts';

let stack: Stack;
let browser: Browser;

beforeAll(async () => {
  buildApp();
  stack = await startStack({ processes: 2, balancer: 'nginx', demoReleases: true });
  browser = await launchBrowser();
}, 900_000);

afterAll(async () => {
  await browser?.close();
  await stack?.stop();
});

async function freshPage(): Promise<Page> {
  await browser.context.clearCookies();
  const page = await browser.newPage();
  // Tall enough that a whole chart card fits on screen when it is screenshotted.
  await page.setViewportSize({ width: 1280, height: 1500 });
  return page;
}

/** A screenshot of one element (a chart and its card), once its canvas is there. */
async function shoot(page: Page, selector: string, name: string): Promise<void> {
  const target = page.locator(selector).first();
  await target.locator('canvas').first().waitFor({ timeout: 60_000 });
  await target.scrollIntoViewIfNeeded();
  // ECharts draws on the next frame after its option is set (animation is off under webdriver).
  await page.waitForTimeout(400);
  await target.screenshot({ path: path.join(SCREENSHOTS, `${name}.png`) });
}

async function openReleases(page: Page, design: string): Promise<void> {
  await page.goto(`${stack.baseUrl}/projects`);
  await page.locator('li', { has: page.locator(`a.design:has-text("${design}")`) }).locator('a.rel:has-text("Releases")').first().click();
  await page.waitForSelector('[data-test="releases-table"] .el-table__row');
}

describe('the seeded demo', () => {
  it('says what it seeded: every state in every project', () => {
    expect(stack.demoLog).toMatch(/15 demo releases in every state seeded in \d+ s/);
    expect(stack.demoLog).toContain('fpga_capture_truncating.csv mismatch (6 mismatches)');
  });

  it('shows the designer every state, the reviewer’s comment, the withdrawal reason, the download log and the diff with both Bode plots', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'designer@example.test');
    await openReleases(page, 'Mains sync PI loop');
    const states = Object.fromEntries(await Promise.all(['v1', 'v2', 'v3', 'v4', 'v5'].map(async (v) => [v, await textOf(page, `[data-test="state-${v}"]`)] as const)));
    expect(states).toEqual({ v1: 'approved', v2: 'changes requested', v3: 'withdrawn', v4: 'in review', v5: 'draft' });
    expect(await page.isVisible('[data-test="safety-notice"]')).toBe(true);
    await screenshot(page, 'demo-01-releases');

    await page.click('[data-test="open-v3"]');
    expect(await textOf(page, '[data-test="withdrawn-reason"]')).toContain('Cut from the wrong revision');

    await page.click('[data-test="open-v2"]');
    await page.click('#tab-reviews');
    const reviews = await tableRows(page, '[data-test="release-reviews"]');
    expect(reviews[0]?.join(' ')).toContain('16-bit coefficients');

    await page.click('[data-test="open-v1"]');
    await page.click('#tab-downloads');
    await page.waitForSelector('[data-test="download-log"] .el-table__row');
    const log = (await tableRows(page, '[data-test="download-log"]')).map((r) => r.join(' '));
    expect(log.filter((r) => r.includes('firmware@example.test')).length).toBeGreaterThanOrEqual(3);
    expect(log.some((r) => r.includes('whole bundle'))).toBe(true);

    // The release's own plots, redrawn from its stored spec.
    await page.click('#tab-numbers');
    await shoot(page, '[data-test="release-detail"] section[aria-label="Closed-loop and error transfer"]', 'demo-02-release-closed-loop');

    // Compare v3 → v4: the diff table and both releases' open loops in one plot.
    await page.locator('[data-test="diff-from"]').click();
    await page.click('.el-select-dropdown:visible .el-select-dropdown__item:has-text("v3")');
    await page.locator('[data-test="diff-to"]').click();
    await page.click('.el-select-dropdown:visible .el-select-dropdown__item:has-text("v4")');
    await page.click('[data-test="compare"]');
    await page.waitForSelector('[data-test="release-diff"]');
    await shoot(page, 'section[aria-label="Bode plots of both releases"]', 'demo-03-diff-bode-overlay');
    await page.close();
  });

  it('draws the editor’s new plots: closed loop and error transfer, step responses, poles and zeros, NCO spectrum', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'designer@example.test');
    await page.goto(`${stack.baseUrl}/projects`);
    await page.click('a.design:has-text("Mains sync PI loop")');
    await page.waitForSelector('[data-test="analysis-status"]:has-text("up to date")');
    await shoot(page, 'section[aria-label="Closed-loop and error transfer"]', 'demo-04-closed-loop-error');
    await shoot(page, 'section[aria-label="Step responses"]', 'demo-05-step-responses');
    await page.click('#tab-quantisation');
    await shoot(page, 'section[aria-label="Poles and zeros per section"]', 'demo-06-pole-zero');
    await page.click('#tab-nco');
    await shoot(page, 'section[aria-label="NCO output spectrum"]', 'demo-07-nco-spectrum');
    await page.close();
  });

  it('gives the reviewer the waiting mail and a review page with all the evidence', async () => {
    const mail = await stack.mail.waitFor((m) => m.subject.startsWith('Review requested:') && m.subject.endsWith('Mains sync PI loop v4'));
    const link = new RegExp(`${stack.baseUrl.replace(/[.:/]/g, '\\$&')}/review/[^\\s"'<>]+`).exec(mail.text);
    expect(link).not.toBeNull();
    const page = await freshPage();
    await page.goto(link![0]);
    await page.waitForSelector('[data-test="submit-decision"]');
    expect(await textOf(page, '[data-test="review-title"]')).toContain('v4');
    expect(await page.isVisible('[data-test="safety-notice"]')).toBe(true);
    await page.waitForSelector('[data-test="manifest-constants"] .el-table__row');
    const constants = (await tableRows(page, '[data-test="manifest-constants"]')).map((r) => r.join(' '));
    expect(constants.some((r) => r.includes('word format'))).toBe(true);
    expect(constants.some((r) => r.includes('code'))).toBe(true);
    expect(await page.locator('[data-test="quantisation-report"] [data-test="q-format"]').first().textContent()).toMatch(/Q/);
    expect(await textOf(page, '[data-test="datapath-verdict"]')).toMatch(/^Data path reaches full scale/);
    await shoot(page, 'section[aria-label="Bode plots of both releases"]', 'demo-08-review-bode-overlay');
    await shoot(page, '[data-test="review-simulation"]', 'demo-09-review-simulation');
    await page.locator('[data-test="review-constants"]').scrollIntoViewIfNeeded();
    await page.locator('[data-test="review-constants"]').screenshot({ path: path.join(SCREENSHOTS, 'demo-10-review-constants.png') });

    // Every file can be read here, through the link, before deciding.
    const files = await tableRows(page, '[data-test="review-files"]');
    expect(files.length).toBeGreaterThan(20);
    for (const row of files) expect(row[2]).toMatch(/^[0-9a-f]{64}$/);
    const header = files.find((r) => r[0]!.endsWith('.h'))![0]!;
    await page.click(`[data-test="read-${header}"]`);
    await page.waitForFunction(() => (document.querySelector('[data-test="file-text"]')?.textContent ?? '').includes('#define'));
    await page.keyboard.press('Escape');
    // Reading used nothing up: the form is still there.
    expect(await page.isVisible('[data-test="submit-decision"]')).toBe(true);
    await page.close();
  });

  it('shows firmware the approved releases and the failing capture against the golden vectors', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'firmware@example.test');
    await page.waitForSelector('[data-test="downloads-table"] .el-table__row');
    expect(await page.isVisible('[data-test="safety-notice"]')).toBe(true);
    const rows = (await tableRows(page, '[data-test="downloads-table"]')).map((r) => r.join(' '));
    expect(rows).toHaveLength(3);
    await page.click('a:has-text("Check conformance")');
    await page.waitForSelector('[data-test="conformance-verdict"]');
    expect(await page.isVisible('[data-test="safety-notice"]')).toBe(true);
    expect(await textOf(page, '[data-test="conformance-verdict"] h2')).toBe('Not bit-exact');
    const mismatches = await tableRows(page, '[data-test="mismatches"]');
    expect(mismatches[0]?.slice(0, 2)).toEqual(['2000', 'filter_code']);
    await shoot(page, '[data-test="conformance-verdict"]', 'demo-11-conformance-mismatch');
    const uploads = (await tableRows(page, '[data-test="conformance-runs"]')).map((r) => r.join(' '));
    expect(uploads.some((r) => r.includes('fpga_capture.csv') && r.includes('bit-exact over 65,536 samples'))).toBe(true);
    await page.close();
  });

  it('shows the admin the whole story in the audit trail', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'admin@example.test');
    await page.click('#tab-audit');
    await page.waitForSelector('[data-test="audit"] .el-table__row');
    await page.waitForFunction(() => document.querySelectorAll('[data-test="audit"] .el-table__body .el-table__row').length > 50);
    // Column 3 is the action.
    const actions = new Set((await tableRows(page, '[data-test="audit"]')).map((r) => r[2]));
    for (const action of ['release.cut', 'release.review-requested', 'review.approve', 'review.request-changes', 'release.withdraw', 'release.download', 'release.conformance']) expect(actions).toContain(action);
    await screenshot(page, 'demo-12-admin-audit');
    await page.close();
  });
});
