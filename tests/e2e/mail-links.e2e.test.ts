/**
 * Every link of every hand-off mail, followed in Chromium by the person it is for: the reviewer's
 * review link (signed out), the designer's decision mail and the firmware engineer's approved mail
 * (each signed out first, so the link also survives the sign-in page), and the reviewer's list in the
 * app of what waits. A link passes when its page shows the release the mail names. On the way, a cut
 * of the unchanged design asks before it repeats the last release.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from './harness/build.ts';
import { launchBrowser, signIn, type Browser } from './harness/browser.ts';
import { screenshot, textOf } from './harness/pageHelpers.ts';
import { api, apiSignIn, waitForVerdict } from './harness/api.ts';
import { startStack, type Stack } from './harness/stack.ts';
import type { CaughtMail } from './harness/smtpFake.ts';

let stack: Stack;
let browser: Browser;

beforeAll(async () => {
  buildApp();
  stack = await startStack({ processes: 1, balancer: 'none' });
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await stack?.stop();
});

async function freshPage(): Promise<Page> {
  await browser.context.clearCookies();
  return browser.newPage();
}

/** The one link to the app in a mail (every hand-off mail carries exactly one). */
function linkIn(mail: CaughtMail): string {
  const links = mail.text.match(new RegExp(`${stack.baseUrl.replace(/[.:/]/g, '\\$&')}/[^\\s"'<>]*`, 'g')) ?? [];
  expect(links).toHaveLength(1);
  return links[0]!;
}

/** Opens a link signed out, signs in on the page it lands on, and waits to be back at the link. */
async function followSignedOut(link: string, email: string): Promise<Page> {
  const page = await freshPage();
  await page.goto(link);
  await page.waitForSelector('input[data-test="email"]');
  await page.fill('input[data-test="email"]', email);
  await page.fill('input[data-test="password"]', 'loopwright-demo');
  await page.click('[data-test="sign-in"]');
  const want = new URL(link);
  await page.waitForURL((u) => u.pathname === want.pathname && u.search === want.search);
  return page;
}

async function designIdOf(cookie: string, name: string): Promise<number> {
  const projects = await api<{ projects: { id: number }[] }>(stack.baseUrl, '/api/projects', { cookie });
  for (const p of projects.body.projects) {
    const designs = await api<{ designs: { id: number; name: string }[] }>(stack.baseUrl, `/api/projects/${p.id}/designs`, { cookie });
    const found = designs.body.designs.find((d) => d.name === name);
    if (found) return found.id;
  }
  throw new Error(`no design named ${name}`);
}

describe('links in the hand-off mails', () => {
  it('each opens the page of the release it names, for its reader', async () => {
    const designer = (await apiSignIn(stack.baseUrl, 'designer@example.test')).cookie;
    const designId = await designIdOf(designer, 'Carrier tracker');
    const cut = await api<{ id: number; label: string; manifestSha256: string }>(stack.baseUrl, `/api/designs/${designId}/releases`, { method: 'POST', cookie: designer });
    expect(cut.status).toBe(201);
    const { id, label } = cut.body;
    expect((await waitForVerdict(stack.baseUrl, designer, id)).verdict).toBe('passed');
    const reviewers = await api<{ reviewers: { id: number; email: string }[] }>(stack.baseUrl, '/api/reviewers', { cookie: designer });
    const robin = reviewers.body.reviewers.find((r) => r.email === 'reviewer@example.test')!;
    expect((await api(stack.baseUrl, `/api/releases/${id}/reviews`, { cookie: designer, json: { reviewerIds: [robin.id], approvalsRequired: 1 } })).status).toBe(200);
    const title = `Ultrasonic flow meter / Carrier tracker ${label}`;

    // The reviewer's list in the app names the release and opens it.
    const list = await freshPage();
    await signIn(list, stack.baseUrl, 'reviewer@example.test');
    await list.click('[data-test="nav-reviews"]');
    await list.waitForSelector(`[data-test="open-review-${id}"]`);
    await screenshot(list, 'mail-01-my-reviews');
    await list.click(`[data-test="open-review-${id}"]`);
    await list.waitForSelector('[data-test="release-detail"] h2');
    expect(await textOf(list, '[data-test="release-detail"] h2')).toBe(label);
    await list.close();

    // Review request -> the review page of that release, signed out (the token is the authority).
    const request = await stack.mail.waitFor((m) => m.subject === `Review requested: ${title}`);
    const review = await freshPage();
    await review.goto(linkIn(request));
    await review.waitForSelector('[data-test="submit-decision"]');
    expect(await review.textContent('body')).toContain(cut.body.manifestSha256);
    await review.click('[data-test="submit-decision"]');
    await review.waitForSelector('[data-test="review-outcome"]');
    await review.close();

    // Decision -> the designer's releases page with that release opened.
    const decided = await stack.mail.waitFor((m) => m.subject === `Approved by Robin Reviewer: ${title}` && m.to.includes('designer@example.test'));
    const designerPage = await followSignedOut(linkIn(decided), 'designer@example.test');
    await designerPage.waitForSelector('[data-test="release-detail"] h2');
    expect(await textOf(designerPage, '[data-test="release-detail"] h2')).toBe(label);
    expect(await textOf(designerPage, '[data-test="selected-state"]')).toBe('approved');

    // Nothing changed since: cutting again asks first, and cuts only when told to.
    const next = `v${Number(label.slice(1)) + 1}`;
    await designerPage.click('[data-test="cut-release"]');
    await designerPage.waitForSelector('[data-test="identical-cut"]');
    expect(await textOf(designerPage, '[data-test="identical-cut"]')).toContain(`same as that of ${label}`);
    await screenshot(designerPage, 'mail-03-identical-cut');
    await designerPage.click('[data-test="cancel-identical-cut"]');
    await designerPage.waitForSelector('[data-test="identical-cut"]', { state: 'hidden' });
    expect(await designerPage.locator(`[data-test="state-${next}"]`).count()).toBe(0);
    await designerPage.click('[data-test="cut-release"]');
    await designerPage.click('[data-test="confirm-identical-cut"]');
    await designerPage.waitForSelector(`[data-test="state-${next}"]`, { timeout: 60_000 });
    await designerPage.close();

    // Approved -> Downloads with that release opened on its files, for firmware.
    const approved = await stack.mail.waitFor((m) => m.subject === `Release approved: ${title}` && m.to.includes('firmware@example.test'));
    const firmware = await followSignedOut(linkIn(approved), 'firmware@example.test');
    await firmware.waitForSelector('[data-test="downloads-table"] tr.is-linked');
    expect(await textOf(firmware, '[data-test="downloads-table"] tr.is-linked')).toContain(label);
    expect(await firmware.textContent('[data-test="downloads-table"] .el-table__expanded-cell')).toContain('manifest.json');
    expect(await firmware.textContent('body')).not.toContain('Nothing here');
    await screenshot(firmware, 'mail-02-downloads-linked');
    await firmware.close();
  });
});
