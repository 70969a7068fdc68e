import fs from 'node:fs/promises';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { SCREENSHOTS } from './paths.ts';

export async function screenshot(page: Page, name: string): Promise<void> {
  await fs.mkdir(SCREENSHOTS, { recursive: true });
  await page.screenshot({ path: path.join(SCREENSHOTS, `${name}.png`) });
}

/** Pick an option of an Element Plus select by its visible label. */
export async function choose(page: Page, selectTestId: string, optionLabel: string): Promise<void> {
  await page.click(`[data-test="${selectTestId}"]`);
  await page.click(`.el-select-dropdown:visible .el-select-dropdown__item:has-text("${optionLabel}")`);
}

export async function textOf(page: Page, selector: string): Promise<string> {
  return ((await page.textContent(selector)) ?? '').trim();
}

/** Waits until the text at selector differs from `before`, and returns it. */
export async function waitForChange(page: Page, selector: string, before: string, timeoutMs = 15_000): Promise<string> {
  await page.waitForFunction(
    ([sel, old]) => {
      const el = document.querySelector(sel as string);
      return el !== null && (el.textContent ?? '').trim() !== old;
    },
    [selector, before],
    { timeout: timeoutMs },
  );
  return textOf(page, selector);
}

export function degrees(text: string): number {
  const match = /(-?\d+(\.\d+)?)/.exec(text);
  if (!match) throw new Error(`no number in "${text}"`);
  return Number(match[1]);
}

/** The cell texts of each body row of an Element Plus table, trimmed. */
export async function tableRows(page: Page, tableSelector: string): Promise<string[][]> {
  const rows = page.locator(`${tableSelector} .el-table__body tr.el-table__row`);
  const out: string[][] = [];
  for (let i = 0; i < (await rows.count()); i++) {
    out.push((await rows.nth(i).locator('td').allTextContents()).map((t) => t.trim()));
  }
  return out;
}
