/** Debian's Chromium through playwright-core, launched exactly as STACK.md "Browser tests" says. */
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

export interface Browser {
  readonly context: BrowserContext;
  newPage(): Promise<Page>;
  close(): Promise<void>;
}

export async function launchBrowser(options: { downloadsPath?: string } = {}): Promise<Browser> {
  const userDataDir = await fs.mkdtemp(path.join(os.tmpdir(), 'lw-chromium-'));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
    viewport: { width: 1280, height: 720 },
    acceptDownloads: true,
    ...(options.downloadsPath ? { downloadsPath: options.downloadsPath } : {}),
  });
  // The machine may be busy with other test suites (2 cores): wait longer than playwright's 30 s.
  context.setDefaultTimeout(60_000);
  context.setDefaultNavigationTimeout(60_000);
  return {
    context,
    newPage: () => context.newPage(),
    async close() {
      await context.close();
      await fs.rm(userDataDir, { recursive: true, force: true });
    },
  };
}

/** Sign in through the sign-in page and wait for the role's home screen. */
export async function signIn(page: Page, baseUrl: string, email: string, password = 'loopwright-demo'): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.waitForSelector('input[data-test="email"]', { timeout: 30_000 }).catch(async (err: unknown) => {
    throw new Error(`the sign-in page did not show its form (at ${page.url()}): ${String(err)}\n${(await page.textContent('body'))?.slice(0, 300) ?? ''}`);
  });
  await page.fill('input[data-test="email"]', email);
  await page.fill('input[data-test="password"]', password);
  await page.click('[data-test="sign-in"]');
  await page.waitForSelector('[data-test="who"]');
}
