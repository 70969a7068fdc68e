/**
 * The first analysis after a design page loads, in Debian's Chromium: a browser of its own per round
 * (fresh profile, so no code cache from an earlier round), signed in, then the design editor opened
 * by its address in a new page, as a bookmark or a reload opens it. Read from the analysis store's
 * performance entry (useAnalysisStore.ts 'lw-analysis-round-trip'): `answeredMs`, from the page's
 * navigation start to the first analysis reaching the page; `roundTripMs`, from the request to that
 * answer (worker start, queueing behind the warm-up, the analysis, the message).
 *
 * Rounds alternate with an emulation of the app before its worker started with the page and warmed
 * up (an init script whose Worker starts the real one at its first job and drops the warm-up
 * message), so the two are measured under the same load.
 */
import type { Page } from 'playwright-core';
import { launchBrowser, signIn } from '../../../tests/e2e/harness/browser.ts';

/** Page-side: a Worker that starts at its first job and never warms up (the app before warm-up). */
const LAZY_UNWARMED_WORKER = `(() => {
  const Real = window.Worker;
  window.Worker = class {
    constructor(url, options) { this.args = [url, options]; this.real = null; this.listeners = []; }
    ensure() {
      if (!this.real) {
        this.real = new Real(...this.args);
        for (const [type, listener, opts] of this.listeners) this.real.addEventListener(type, listener, opts);
      }
      return this.real;
    }
    addEventListener(type, listener, opts) { this.listeners.push([type, listener, opts]); this.real?.addEventListener(type, listener, opts); }
    removeEventListener(type, listener, opts) { this.real?.removeEventListener(type, listener, opts); }
    postMessage(message, transfer) { if (message && message.type === 'warmUp') return; this.ensure().postMessage(message, transfer); }
    terminate() { this.real?.terminate(); }
  };
})()`;

export interface FirstAnalysisRound {
  readonly variant: 'warm' | 'unwarmed';
  readonly answeredMs: number;
  readonly roundTripMs: number;
}

async function designAddress(page: Page, title: string): Promise<string> {
  const href = await page.getAttribute(`a.design:has-text(${JSON.stringify(title)})`, 'href');
  if (!href) throw new Error(`no design link '${title}' on the projects page`);
  return new URL(href, page.url()).href;
}

export async function measureFirstAnalysis(baseUrl: string, rounds: number): Promise<FirstAnalysisRound[]> {
  const out: FirstAnalysisRound[] = [];
  for (let i = 0; i < 2 * rounds; i++) {
    const variant = i % 2 === 0 ? 'warm' : 'unwarmed';
    const browser = await launchBrowser();
    try {
      const signedIn = await browser.newPage();
      await signIn(signedIn, baseUrl, 'designer@example.test');
      const address = await designAddress(signedIn, 'Mains sync PI loop');
      await signedIn.close();
      const page = await browser.newPage();
      if (variant === 'unwarmed') await page.addInitScript(LAZY_UNWARMED_WORKER);
      await page.goto(address);
      await page.waitForSelector('[data-test="analysis-status"]:has-text("up to date")');
      const [answeredMs, roundTripMs] = (await page.evaluate(
        "(() => { const e = performance.getEntriesByName('lw-analysis-round-trip')[0]; return [e.startTime + e.duration, e.duration]; })()",
      )) as [number, number];
      out.push({ variant, answeredMs, roundTripMs });
    } finally {
      await browser.close();
    }
  }
  return out;
}
