/**
 * The product end to end in Debian's Chromium: each role signs in and sees its screens, a designer
 * edits a loop and watches the margins move, simulates, cuts a release and asks for review; the
 * reviewer approves from the e-mailed link; firmware downloads the approved bundle and files and
 * uploads captures for the conformance check.
 *
 * All of it runs through the scale-out layout: two API processes behind Debian's nginx, round-robin,
 * no sticky sessions (the stack's default), so consecutive requests of one page go to different
 * processes. The last test pins down the cross-process cases one by one.
 */
import { createHash } from 'node:crypto';
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from './harness/build.ts';
import { launchBrowser, signIn, type Browser } from './harness/browser.ts';
import { choose, degrees, screenshot, tableRows, textOf, waitForChange } from './harness/pageHelpers.ts';
import { afterProcess, api, apiSignIn, PROCESS_HEADER, waitForVerdict } from './harness/api.ts';
import { startStack, type Stack } from './harness/stack.ts';

let stack: Stack;
let browser: Browser;
let downloads: string;
/** Which serving process answered each of the browser's /api requests. */
const servedBy = new Map<string, number>();

beforeAll(async () => {
  buildApp();
  stack = await startStack({ processes: 2, balancer: 'nginx' });
  downloads = await fs.mkdtemp(path.join(os.tmpdir(), 'lw-downloads-'));
  browser = await launchBrowser({ downloadsPath: downloads });
  browser.context.on('response', (response) => {
    const name = response.headers()[PROCESS_HEADER];
    if (name && new URL(response.url()).pathname.startsWith('/api/')) servedBy.set(name, (servedBy.get(name) ?? 0) + 1);
  });
});

afterAll(async () => {
  await browser?.close();
  await stack?.stop();
  if (downloads) await fs.rm(downloads, { recursive: true, force: true });
});

async function freshPage(): Promise<Page> {
  await browser.context.clearCookies();
  return browser.newPage();
}

async function navLabels(page: Page): Promise<string[]> {
  return (await page.locator('nav[aria-label="Main"] li a').allTextContents()).map((t) => t.trim());
}

async function openDesign(page: Page, title: string): Promise<void> {
  await page.goto(`${stack.baseUrl}/projects`);
  await page.click(`a.design:has-text("${title}")`);
  await page.waitForSelector('[data-test="bode-chart"] canvas', { timeout: 20_000 });
  await page.waitForSelector('[data-test="analysis-status"]:has-text("up to date")');
}

/** What the release and review pages say once the server has verified a demo release's reference RTL. */
const BIT_EXACT = 'reference RTL bit-exact in GHDL and Icarus on the first 4,096 of the 65,536 golden samples';

const state: { reviewLink: string; releaseSha: string; vectorsPath: string } = { reviewLink: '', releaseSha: '', vectorsPath: '' };

describe('Loopwright in the browser', () => {
  it('signs each role in to its own screens and keeps the others closed', async () => {
    const page = await freshPage();
    await page.goto(`${stack.baseUrl}/admin`);
    await page.waitForSelector('input[data-test="email"]');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await screenshot(page, '01-sign-in');

    await page.fill('input[data-test="email"]', 'designer@example.test');
    await page.fill('input[data-test="password"]', 'not-the-password');
    await page.click('[data-test="sign-in"]');
    await page.waitForSelector('[data-test="sign-in-error"]');
    expect(await textOf(page, '[data-test="sign-in-error"]')).toMatch(/wrong e-mail or password/i);

    const expected: Record<string, { nav: string[]; home: string }> = {
      'designer@example.test': { nav: ['Projects', 'Downloads', 'Conformance'], home: '/projects' },
      'reviewer@example.test': { nav: ['Projects', 'My reviews', 'Downloads'], home: '/projects' },
      'firmware@example.test': { nav: ['Downloads', 'Conformance'], home: '/downloads' },
      'admin@example.test': { nav: ['Projects', 'Admin'], home: '/admin' },
    };
    for (const [email, want] of Object.entries(expected)) {
      const p = await freshPage();
      await signIn(p, stack.baseUrl, email);
      await p.waitForURL((u) => u.pathname === want.home);
      expect(await navLabels(p)).toEqual(want.nav);
      await p.close();
    }

    // Keyboard only: type, Tab to the password, Enter signs in.
    const keys = await freshPage();
    await keys.goto(`${stack.baseUrl}/sign-in`);
    await keys.focus('input[data-test="email"]');
    await keys.keyboard.type('reviewer@example.test');
    await keys.keyboard.press('Tab');
    expect(await keys.evaluate(() => document.activeElement?.getAttribute('data-test'))).toBe('password');
    await keys.keyboard.type('loopwright-demo');
    await keys.keyboard.press('Enter');
    await keys.waitForURL((u) => u.pathname === '/projects');
    await keys.close();

    const firmware = await freshPage();
    await signIn(firmware, stack.baseUrl, 'firmware@example.test');
    await firmware.goto(`${stack.baseUrl}/admin`);
    await firmware.waitForURL((u) => u.pathname === '/downloads');
    await firmware.close();
    await page.close();
  });

  it('lets the admin create and disable accounts and filter the audit trail', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'admin@example.test');
    await page.waitForSelector('[data-test="accounts"] .el-table__row');
    const emails = await page.locator('[data-test="accounts"] .el-table__row td:first-child').allTextContents();
    expect(emails.map((e) => e.trim())).toEqual(expect.arrayContaining(['designer@example.test', 'reviewer@example.test', 'firmware@example.test', 'admin@example.test']));
    await screenshot(page, '10-admin-accounts');

    await page.click('[data-test="new-account"]');
    await page.fill('input[data-test="new-email"]', 'casey@example.test');
    await page.fill('input[data-test="new-name"]', 'Casey Bench');
    await page.fill('input[data-test="new-password"]', 'short');
    await page.click('.el-dialog .el-checkbox:has-text("firmware")');
    await page.click('[data-test="create-account"]');
    await page.waitForSelector('[data-test="account-error"]');
    expect(await textOf(page, '[data-test="account-error"]')).toBe('Password must be at least 10 characters.');
    await page.fill('input[data-test="new-password"]', 'casey-bench-password');
    await page.click('[data-test="create-account"]');
    const casey = page.locator('[data-test="accounts"] .el-table__row', { hasText: 'casey@example.test' });
    await casey.waitFor();
    // Casey works in a browser of their own while the admin disables the account.
    const caseyBrowser = await launchBrowser();
    const caseyPage = await caseyBrowser.newPage();
    await signIn(caseyPage, stack.baseUrl, 'casey@example.test', 'casey-bench-password');
    await caseyPage.waitForURL((u) => u.pathname === '/downloads');
    await casey.locator('.el-switch').click();
    await page.waitForSelector('.el-message--success');
    await caseyPage.click('[data-test="nav-conformance"]');
    await caseyPage.waitForSelector('[data-test="session-ended"]');
    expect(new URL(caseyPage.url()).searchParams.get('redirect')).toBe('/conformance');
    await caseyPage.fill('input[data-test="email"]', 'casey@example.test');
    await caseyPage.fill('input[data-test="password"]', 'casey-bench-password');
    await caseyPage.click('[data-test="sign-in"]');
    await caseyPage.waitForSelector('[data-test="sign-in-error"]');
    expect(await textOf(caseyPage, '[data-test="sign-in-error"]')).toMatch(/disabled/);
    await caseyBrowser.close();
    await page.click('#tab-audit');
    await page.waitForSelector('[data-test="audit"] .el-table__row');
    await page.fill('input[data-test="audit-search"]', 'firmware@example.test');
    await page.waitForTimeout(300);
    const actors = await page.locator('[data-test="audit"] .el-table__body .el-table__row td:nth-child(2)').allTextContents();
    expect(actors.length).toBeGreaterThan(0);
    for (const a of actors) expect(a.trim()).toBe('firmware@example.test');
    await screenshot(page, '11-admin-audit');
    await page.close();
  });

  it('re-analyses in the browser as the designer types, with schema messages on bad fields', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'designer@example.test');
    await screenshot(page, '02-projects');
    let analysisRequests = 0;
    page.on('request', (r) => {
      if (/\/api\/(designs\/\d+\/)?analysis/.test(r.url())) analysisRequests++;
    });
    await openDesign(page, 'Mains sync PI loop');
    await screenshot(page, '03-editor-response');

    const pmBeforeText = await textOf(page, '[data-test="row-phase-margin-discrete"]');
    const pmBefore = degrees(pmBeforeText);
    // Lower damping, lower phase margin: for the second-order type-2 loop PM = atan(2ζ/√(√(1+4ζ⁴)−2ζ²))
    // falls monotonically with ζ (Gardner, Phaselock Techniques, 3rd ed., ch. 2; from memory).
    await page.fill('input[data-test="filter-damping"]', '0.35');
    const pmAfterText = await waitForChange(page, '[data-test="row-phase-margin-discrete"]', pmBeforeText);
    const pmAfter = degrees(pmAfterText);
    expect(pmAfter).toBeLessThan(pmBefore - 5);
    expect(await textOf(page, '[data-test="verdict-phase-margin"]')).toBe(pmAfterText);
    expect(analysisRequests).toBe(0);

    await page.fill('input[data-test="clock-hz"]', 'fast');
    const clockError = page.locator('.el-form-item:has(input[data-test="clock-hz"]) .el-form-item__error');
    await clockError.waitFor();
    expect(await clockError.textContent()).toMatch(/number/i);
    expect(await page.isDisabled('[data-test="save-design"]')).toBe(true);
    await page.fill('input[data-test="clock-hz"]', '100000000');
    await clockError.waitFor({ state: 'detached' });

    await page.click('#tab-quantisation');
    await page.waitForSelector('[data-test="coefficients"] .el-table__row');
    await screenshot(page, '04-editor-quantisation');

    await page.click('[data-test="save-design"]');
    await page.waitForSelector('[data-test="design-name"]');
    await page.waitForFunction(() => !document.querySelector('[data-test="unsaved"]'));
    expect(await textOf(page, '.head .lw-muted')).toMatch(/revision 2/);
    await page.close();
  });

  it('explains each choice of the spec beside its field, with its source', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'designer@example.test');
    await openDesign(page, 'Mains sync PI loop');
    await page.click('[data-test="why-filter-damping"]');
    const damping = await textOf(page, '[data-test="guide-filter-damping"]');
    expect(damping).toMatch(/phase margin/i);
    expect(damping).toContain('Source: Og5');
    await page.click('[data-test="why-fixed-point-rounding"]');
    expect(await textOf(page, '[data-test="guide-fixed-point-rounding"]')).toMatch(/Truncation.*half an LSB/);
    await page.locator('[data-test="guide-filter-damping"]').scrollIntoViewIfNeeded();
    await screenshot(page, '16-editor-guidance');
    await page.click('[data-test="guidance-all"]');
    expect(await page.locator('.guide').count()).toBeGreaterThan(8);
    await page.close();
  });

  it('creates a project and a design from a template, and opens it in the editor', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'designer@example.test');
    await page.click('[data-test="new-project"]');
    await page.fill('input[data-test="project-name"]', 'Resolver tracking');
    await page.click('[data-test="create-project"]');
    const card = page.locator('section.project', { hasText: 'Resolver tracking' });
    await card.waitFor();
    expect(await card.textContent()).toContain('0 designs');
    await card.locator('[data-test="new-design"]').click();
    await page.fill('input[data-test="design-title"]', 'Resolver loop');
    await choose(page, 'design-template', 'Ultrasonic carrier, lag-lead');
    await page.click('[data-test="create-design"]');
    await page.waitForURL((u) => /^\/designs\/\d+$/.test(u.pathname));
    await page.waitForSelector('[data-test="bode-chart"] canvas');
    expect(await textOf(page, '[data-test="design-name"]')).toBe('Resolver loop');
    expect(await page.inputValue('input[data-test="filter-tau1-s"]')).toBe('0.00026');
    await page.close();
  });

  it('exports a spec, imports it as a new design, duplicates, archives, restores and deletes designs', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'designer@example.test');
    const card = page.locator('section.project', { hasText: 'Ultrasonic flow meter' });
    const row = (title: string) => card.locator('li[data-test^="design-row-"]', { hasText: title });
    await row('Carrier tracker').waitFor();

    const exported = page.waitForEvent('download');
    await row('Carrier tracker').locator('a[data-test^="export-"]').click();
    const specFile = await exported;
    const specText = await fs.readFile((await specFile.path())!, 'utf8');
    const spec = JSON.parse(specText) as { name: string; specVersion: number };
    expect(spec.specVersion).toBe(1);
    expect(specFile.suggestedFilename()).toBe(`${spec.name}.spec.json`);

    // A file with a wrong field is refused, naming the field; nothing is created.
    const broken = path.join(downloads, 'broken.spec.json');
    await fs.writeFile(broken, JSON.stringify({ ...spec, sampleRateHz: -1 }));
    await card.locator('[data-test="import-design"]').click();
    await page.setInputFiles('input[data-test="import-file"]', broken);
    await page.click('[data-test="confirm-import"]');
    await page.waitForSelector('[data-test="import-error"]');
    // Named by the form's label, not the spec path.
    expect(await textOf(page, '[data-test="import-error"]')).toMatch(/Loop update rate/);

    const good = path.join(downloads, specFile.suggestedFilename());
    await fs.writeFile(good, specText);
    await page.setInputFiles('input[data-test="import-file"]', good);
    await page.fill('input[data-test="import-title"]', 'Imported flow-meter loop');
    await page.click('[data-test="confirm-import"]');
    await page.waitForURL((u) => /^\/designs\/\d+$/.test(u.pathname));
    await page.waitForSelector('[data-test="bode-chart"] canvas');
    expect(await textOf(page, '[data-test="design-name"]')).toBe('Imported flow-meter loop');
    expect(await page.inputValue('input[data-test="name"]')).toBe(spec.name);

    await page.click('[data-test="nav-projects"]');
    await row('Imported flow-meter loop').locator('[data-test^="design-menu-"]').click();
    await page.click('.el-dropdown-menu:visible [data-test="design-duplicate"]');
    await page.fill('input[data-test="duplicate-title"]', 'Flow-meter loop variant');
    await page.click('[data-test="confirm-duplicate"]');
    await row('Flow-meter loop variant').waitFor();
    await screenshot(page, '15-projects-design-actions');

    await row('Flow-meter loop variant').locator('[data-test^="design-menu-"]').click();
    await page.click('.el-dropdown-menu:visible [data-test="design-archive"]');
    await row('Flow-meter loop variant').waitFor({ state: 'detached' });
    await page.click('[data-test="show-archived"]');
    await row('Flow-meter loop variant').locator('[data-test="archived-tag"]').waitFor();
    await row('Flow-meter loop variant').locator('a.design').click();
    await page.waitForSelector('[data-test="archived-notice"]');
    expect(await page.isVisible('[data-test="save-design"]')).toBe(false);
    expect(await page.isDisabled('input[data-test="center-hz"]')).toBe(true);

    await page.click('[data-test="nav-projects"]');
    await row('Flow-meter loop variant').locator('[data-test^="design-menu-"]').click();
    await page.click('.el-dropdown-menu:visible [data-test="design-restore"]');
    await row('Flow-meter loop variant').locator('[data-test="archived-tag"]').waitFor({ state: 'detached' });

    page.once('dialog', (d) => void d.accept());
    await row('Imported flow-meter loop').locator('[data-test^="design-menu-"]').click();
    await page.click('.el-dropdown-menu:visible [data-test="design-delete"]');
    await row('Imported flow-meter loop').waitFor({ state: 'detached' });
    await page.close();
  });

  it('shows what changed when two designers save the same design, and merges on request', async () => {
    await browser.context.clearCookies();
    const a = await browser.newPage();
    await signIn(a, stack.baseUrl, 'designer@example.test');
    const b = await browser.newPage();
    await openDesign(a, 'Carrier tracker');
    await openDesign(b, 'Carrier tracker');
    await a.fill('input[data-test="filter-cutoff-hz"]', '1500');
    await a.click('[data-test="save-design"]');
    await a.waitForFunction(() => !document.querySelector('[data-test="unsaved"]'));

    await b.fill('input[data-test="center-hz"]', '41000');
    await b.click('[data-test="save-design"]');
    await b.waitForSelector('[data-test="conflict-dialog"] .el-table__row');
    const rows = (await tableRows(b, '[data-test="conflict-dialog"]')).map((cells) => cells.join('|'));
    // Columns: field, when you started, saved meanwhile, your edit, clash marker.
    expect(rows).toEqual(expect.arrayContaining(['centerHz|40000|40000|41000|', 'filter.cutoffHz|1600|1500|1600|']));
    await screenshot(b, '13-save-conflict');
    await b.click('[data-test="conflict-keep-mine"]');
    await b.waitForFunction(() => !document.querySelector('[data-test="unsaved"]'));
    await b.reload();
    await b.waitForSelector('input[data-test="center-hz"]');
    expect(await b.inputValue('input[data-test="center-hz"]')).toBe('41000');
    expect(await b.inputValue('input[data-test="filter-cutoff-hz"]')).toBe('1500');
    expect(await textOf(b, '.head .lw-muted')).toMatch(/revision 3/);
    await a.close();
    await b.close();
  });

  it('runs a float and bit-true simulation to completion with progress', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'designer@example.test');
    await openDesign(page, 'Mains sync PI loop');
    await page.click('#tab-simulation');
    // A long run (5 M samples) is cancelled part-way; the panel says so and offers to run again.
    await page.fill('input[data-test="scenario-durationS"]', '500');
    await page.click('[data-test="run-simulation"]');
    await page.waitForSelector('[data-test="cancel-simulation"]');
    await page.waitForFunction(() => /[1-9]\d*%/.test(document.querySelector('[data-test="simulation-progress"]')?.textContent ?? ''));
    await page.click('[data-test="cancel-simulation"]');
    await page.waitForSelector('[data-test="simulation-cancelled"]');
    expect(await page.isVisible('[data-test="trace-chart"]')).toBe(false);
    await page.fill('input[data-test="scenario-durationS"]', '5');
    await choose(page, 'scenario-kind', 'FM, sine modulation');
    await page.click('[data-test="run-simulation"]');
    await page.waitForSelector('[data-test="trace-chart"] canvas', { timeout: 120_000 });
    expect(await textOf(page, '[data-test="simulation-progress"]')).toContain('100%');
    expect(await textOf(page, '[data-test="metric-locked"] td:nth-child(2)')).toBe('yes');
    expect(await textOf(page, '[data-test="metric-locked"] td:nth-child(3)')).toBe('yes');
    expect(await textOf(page, '[data-test="simulation-summary"]')).toMatch(/samples at .*bit-true checksum 0x[0-9a-f]{8}/);
    await screenshot(page, '05-editor-simulation');

    await page.click('#tab-word-length');
    await page.click('[data-test="run-word-length"]');
    await page.waitForSelector('[data-test="word-length-result"]', { timeout: 120_000 });
    const cheapest = await textOf(page, '[data-test="word-length-cheapest"]');
    expect(cheapest).toMatch(/^Coefficient width \d+ bits/);
    // Each width tried, with why it passes or fails.
    expect(await textOf(page, '[data-test="width-verdicts"]')).toMatch(/Coefficients \d+ bits\s*fails\s*[A-Z][^.]*\./);
    // Beside the error figures, each width's cost: the server's yosys estimate, filled in as it comes.
    await page.waitForSelector('[data-test="width-costs"] tr:has-text("coefficients")');
    await screenshot(page, '06-editor-word-length');
    await page.close();
  });

  it('cuts a release and asks the reviewer, who gets an e-mailed link', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'designer@example.test');
    await openDesign(page, 'Mains sync PI loop');
    await page.click('text=Releases');
    await page.waitForSelector('[data-test="cut-release"]');
    await page.click('[data-test="cut-release"]');
    await page.waitForSelector('[data-test="state-v1"]', { timeout: 60_000 });
    expect(await textOf(page, '[data-test="state-v1"]')).toBe('draft');
    expect(await page.isVisible('[data-test="safety-notice"]')).toBe(true);
    state.releaseSha = (await textOf(page, '[data-test="selected-sha"]')).replace('SHA-256 ', '');
    expect(state.releaseSha).toMatch(/^[0-9a-f]{64}$/);
    // The server verifies the reference RTL in the background; the page follows it to the verdict.
    await page.waitForSelector(`[data-test="rtl-verification-summary"]:has-text("${BIT_EXACT}")`, { timeout: 180_000 });
    await page.click('#tab-rtl');
    await page.waitForSelector('[data-test="rtl-simulators"]:has-text("PASS")');
    await page.waitForSelector('[data-test="rtl-estimate"]');
    await screenshot(page, '07b-reference-rtl');
    await page.click('#tab-numbers');

    await page.click('[data-test="request-review"]');
    await choose(page, 'reviewers', 'Robin Reviewer');
    await page.keyboard.press('Escape');
    await page.click('[data-test="send-review"]');
    await page.waitForSelector('[data-test="state-v1"]:has-text("in review")');
    await page.waitForSelector('[data-test="release-detail"] [data-test="bode-chart"] canvas');
    await screenshot(page, '07-releases');

    const mail = await stack.mail.waitFor((m) => m.to.includes('reviewer@example.test'));
    expect(mail.text).toContain(`Server verification: ${BIT_EXACT}.`);
    const link = new RegExp(`${stack.baseUrl.replace(/[.:/]/g, '\\$&')}/review/[^\\s"'<>]+`).exec(mail.text);
    expect(link).not.toBeNull();
    state.reviewLink = link![0];
    await page.close();
  });

  it('approves the release from the review link with a deliberate POST', async () => {
    const page = await freshPage();
    const posts: string[] = [];
    page.on('request', (r) => {
      // The link itself; the files the page reads with it (/files/...) leave it unused.
      if (/\/api\/review-links\/[^/?]+$/.test(r.url())) posts.push(r.method());
    });
    await page.goto(state.reviewLink);
    await page.waitForSelector('[data-test="submit-decision"]');
    await page.waitForSelector('[data-test="bode-chart"] canvas');
    expect(await page.isVisible('[data-test="safety-notice"]')).toBe(true);
    expect(await textOf(page, '[data-test="review-title"]')).toContain('v1');
    expect(await textOf(page, '[data-test="rtl-verification-summary"]')).toBe(BIT_EXACT);
    expect(posts.length).toBeGreaterThan(0);
    expect(posts.filter((m) => m !== 'GET'), 'opening the link sends nothing but reads').toEqual([]);
    await screenshot(page, '08-review');
    await page.fill('textarea[data-test="review-comment"]', 'Margins and codes checked against the bench plan.');
    await page.click('[data-test="submit-decision"]');
    await page.waitForSelector('[data-test="review-outcome"]');
    expect(await textOf(page, '[data-test="review-outcome"]')).toMatch(/approved/);
    // Until the RTL verdict (and the resource estimate) is done the page reads the link again now and
    // then; reading never uses it up. The decision is one POST, sent by the click.
    expect(posts[0]).toBe('GET');
    expect(posts.filter((m) => m !== 'GET')).toEqual(['POST']);

    // The link is single-use: opening it again shows the server's refusal, not the form.
    const again = await freshPage();
    await again.goto(state.reviewLink);
    await again.waitForSelector('[data-test="review-error"], [data-test="submit-decision"]');
    expect(await again.isVisible('[data-test="submit-decision"]')).toBe(false);
    await again.close();
    await page.close();
  });

  it('gives firmware the approved release, whose downloads match their SHA-256', async () => {
    await stack.mail.waitFor((m) => m.to.includes('firmware@example.test'));
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'firmware@example.test');
    await page.waitForSelector('[data-test="downloads-table"] .el-table__row');
    const firstRow = page.locator('[data-test="downloads-table"] .el-table__body > tbody > tr.el-table__row').first();
    expect(await firstRow.textContent()).toContain('Mains sync PI loop');
    await screenshot(page, '09-downloads');

    const bundleDownload = page.waitForEvent('download');
    await firstRow.locator('a:has-text("Bundle")').click();
    const bundle = await bundleDownload;
    const bundleBytes = await fs.readFile((await bundle.path())!);
    // A zip file starts with the local file header signature PK\x03\x04 (APPNOTE.TXT 4.3.7).
    expect(bundleBytes.subarray(0, 4)).toEqual(Buffer.from([0x50, 0x4b, 0x03, 0x04]));

    await firstRow.locator('.el-table__expand-icon').click();
    const vectorsLink = page.locator('a[data-test$="_vectors.csv"]').first();
    await vectorsLink.waitFor();
    const row = page.locator('tr', { has: vectorsLink }).last();
    const shownSha = ((await row.locator('td').nth(2).textContent()) ?? '').trim();
    const fileDownload = page.waitForEvent('download');
    await vectorsLink.click();
    const file = await fileDownload;
    const vectors = await fs.readFile((await file.path())!);
    expect(createHash('sha256').update(vectors).digest('hex')).toBe(shownSha);
    const vectorsPath = path.join(downloads, 'golden.csv');
    await fs.writeFile(vectorsPath, vectors);
    state.vectorsPath = vectorsPath;
    await page.close();
  });

  it('checks uploaded captures: the golden vectors are bit-exact, an altered one is not', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'firmware@example.test');
    await page.waitForSelector('[data-test="downloads-table"] .el-table__row');
    await page.click('a:has-text("Check conformance")');
    await page.waitForSelector('input[data-test="capture-file"]');

    await page.setInputFiles('input[data-test="capture-file"]', state.vectorsPath);
    await page.click('[data-test="upload-capture"]');
    await page.waitForSelector('[data-test="conformance-verdict"]');
    expect(await textOf(page, '[data-test="conformance-verdict"] h2')).toBe('Bit-exact');

    const lines = (await fs.readFile(state.vectorsPath, 'utf8')).trimEnd().split('\n');
    const header = lines[0]!.split(',');
    const cells = lines[6]!.split(',');
    const column = header.length - 1;
    const original = cells[column]!;
    cells[column] = String(Number(original) + 1);
    lines[6] = cells.join(',');
    const altered = path.join(downloads, 'altered.csv');
    await fs.writeFile(altered, `${lines.join('\n')}\n`);
    await page.setInputFiles('input[data-test="capture-file"]', altered);
    await page.click('[data-test="upload-capture"]');
    await page.waitForSelector('[data-test="conformance-verdict"] h2:has-text("Not bit-exact")');
    const first = page.locator('[data-test="mismatches"] .el-table__row').first();
    const firstCells = (await first.locator('td').allTextContents()).map((t) => t.trim());
    // Row 6 of the file is sample 5 (the header is line 0); expected = golden, got = ours.
    expect(firstCells).toEqual(['5', header[column], original, String(Number(original) + 1)]);
    await screenshot(page, '12-conformance');
    await page.close();
  });

  it('compares the next release with the approved one, shows the download log and withdraws', async () => {
    const page = await freshPage();
    await signIn(page, stack.baseUrl, 'designer@example.test');
    await openDesign(page, 'Mains sync PI loop');
    await page.fill('input[data-test="filter-damping"]', '0.6');
    await page.click('[data-test="save-design"]');
    await page.waitForFunction(() => !document.querySelector('[data-test="unsaved"]'));
    await page.click('text=Releases');
    await page.waitForSelector('[data-test="cut-release"]');
    await page.click('[data-test="cut-release"]');
    await page.waitForSelector('[data-test="state-v2"]', { timeout: 60_000 });
    expect(await textOf(page, '[data-test="state-v1"]')).toBe('approved');
    await choose(page, 'diff-from', 'v1');
    await choose(page, 'diff-to', 'v2');
    await page.click('[data-test="compare"]');
    await page.waitForSelector('[data-test="release-diff"] .el-table__row');
    const rows = (await tableRows(page, '[data-test="release-diff"]')).map((cells) => cells.join('|'));
    expect(rows).toContain('Spec|Damping ζ||0.35|0.6|filter.damping');
    expect(await textOf(page, '[data-test="diff-summary"]')).toMatch(/^v1 → v2: changed .*Integer codes/);
    expect(rows.some((r) => r.startsWith('Integer codes'))).toBe(true);
    await screenshot(page, '14-release-diff');

    // Every firmware download of v1 is in its log.
    await page.click('[data-test="open-v1"]');
    await page.click('#tab-downloads');
    await page.waitForSelector('[data-test="download-log"] .el-table__row');
    const log = (await tableRows(page, '[data-test="download-log"]')).map((cells) => `${cells[1]}|${cells[2]}`);
    expect(log).toEqual(expect.arrayContaining(["firmware@example.test|whole bundle (zip)", expect.stringMatching(/^firmware@example\.test\|.*_vectors\.csv$/)]));

    // v2 is withdrawn: it stays listed, marked so.
    await page.click('[data-test="open-v2"]');
    await page.click('[data-test="withdraw"]');
    await page.fill('textarea[data-test="withdraw-reason"]', 'superseded before review');
    await page.click('[data-test="confirm-withdraw"]');
    await page.waitForSelector('[data-test="state-v2"]:has-text("withdrawn")');
    await page.close();
  });

  it('serves every step from either API process: a session, release numbers, a review link and downloads cross processes', async () => {
    const { baseUrl } = stack;
    // The browser's requests above were spread over both processes by nginx.
    expect([...servedBy.keys()].sort()).toEqual(['api-1', 'api-2']);
    for (const count of servedBy.values()) expect(count).toBeGreaterThan(20);

    // A session made by one process is honoured by the other: sessions live in MariaDB.
    const designer = await apiSignIn(baseUrl, 'designer@example.test');
    await afterProcess(baseUrl, designer.process!);
    const who = await api<{ user: { email: string } }>(baseUrl, '/api/session', { cookie: designer.cookie });
    expect(who.process).not.toBe(designer.process);
    expect(who.status).toBe(200);
    expect(who.body.user.email).toBe('designer@example.test');

    // Six cuts at once, answered by both processes: v1 … v6, no gap and no repeat (the number is taken
    // under a row lock in MariaDB, never counted in a process).
    const projects = await api<{ projects: { id: number; name: string }[] }>(baseUrl, '/api/projects', { cookie: designer.cookie });
    const project = projects.body.projects.find((p) => p.name === 'IF FM demodulator')!;
    const designs = await api<{ designs: { id: number; name: string }[] }>(baseUrl, `/api/projects/${project.id}/designs`, { cookie: designer.cookie });
    const designId = designs.body.designs.find((d) => d.name === 'FM demodulator loop')!.id;
    const cuts = await Promise.all(
      Array.from({ length: 6 }, () => api<{ id: number; number: number; manifestSha256: string }>(baseUrl, `/api/designs/${designId}/releases`, { method: 'POST', cookie: designer.cookie })),
    );
    expect(cuts.map((c) => c.status)).toEqual([201, 201, 201, 201, 201, 201]);
    expect(cuts.map((c) => c.body.number).sort((a, b) => a - b)).toEqual([1, 2, 3, 4, 5, 6]);
    expect(new Set(cuts.map((c) => c.process))).toEqual(new Set(['api-1', 'api-2']));

    // A review link read on one process decides on the other, and only once on either.
    const v1 = cuts.find((c) => c.body.number === 1)!.body;
    // Approval waits for the reference RTL's verification, which a process of the pair picked up.
    expect((await waitForVerdict(baseUrl, designer.cookie, v1.id)).verdict).toBe('passed');
    const reviewers = await api<{ reviewers: { id: number; email: string }[] }>(baseUrl, '/api/reviewers', { cookie: designer.cookie });
    const robin = reviewers.body.reviewers.find((r) => r.email === 'reviewer@example.test')!;
    const asked = await api(baseUrl, `/api/releases/${v1.id}/reviews`, { cookie: designer.cookie, json: { reviewerIds: [robin.id], approvalsRequired: 1 } });
    expect(asked.status).toBe(200);
    const mail = await stack.mail.waitFor((m) => m.subject === 'Review requested: IF FM demodulator / FM demodulator loop v1');
    const token = /\/review\/([^\s"'<>]+)/.exec(mail.text)![1]!;
    const read = await api(baseUrl, `/api/review-links/${token}`);
    expect(read.status).toBe(200);
    await afterProcess(baseUrl, read.process!);
    const decision = { decision: 'approve', manifestSha256: v1.manifestSha256 };
    const decided = await api<{ state: string }>(baseUrl, `/api/review-links/${token}`, { json: decision });
    expect(decided.process).not.toBe(read.process);
    expect(decided.status).toBe(200);
    expect(decided.body.state).toBe('approved');
    await afterProcess(baseUrl, decided.process!);
    const replayed = await api<{ error: { field: string; message: string } }>(baseUrl, `/api/review-links/${token}`, { json: decision });
    expect(replayed.process).toBe(read.process);
    expect(replayed.status).toBe(403);
    expect(replayed.body.error.message).toMatch(/already used/);

    // The same file from each process: the same bytes, matching the SHA-256 the release stores.
    const release = await api<{ files: { name: string; sha256: string }[] }>(baseUrl, `/api/releases/${v1.id}`, { cookie: designer.cookie });
    const vectors = release.body.files.find((f) => f.name.endsWith('_vectors.csv'))!;
    const first = await api(baseUrl, `/api/releases/${v1.id}/files/${vectors.name}`, { cookie: designer.cookie });
    await afterProcess(baseUrl, first.process!);
    const second = await api(baseUrl, `/api/releases/${v1.id}/files/${vectors.name}`, { cookie: designer.cookie });
    expect(second.process).not.toBe(first.process);
    for (const download of [first, second]) {
      expect(download.status).toBe(200);
      expect(createHash('sha256').update(download.bytes).digest('hex')).toBe(vectors.sha256);
    }

    // An upload through the balancer: the golden vectors, compared by whichever process gets them.
    const form = new FormData();
    form.append('file', new Blob([new Uint8Array(first.bytes)], { type: 'text/csv' }), 'capture.csv');
    const upload = await api<{ verdict: string }>(baseUrl, `/api/releases/${v1.id}/conformance`, { cookie: designer.cookie, form });
    expect(upload.status).toBe(201);
    expect(upload.body.verdict).toBe('bit-exact');
  });
});
