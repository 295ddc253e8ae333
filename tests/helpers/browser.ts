// Debian's Chromium driven by playwright-core, with sign-in and console-error capture.
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { inject } from 'vitest';

export const DEMO_PASSWORD = 'beadpath-demo';
export const PHONE = { width: 390, height: 844 };
export const DESKTOP = { width: 1366, height: 900 };

export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM || '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

export function baseUrl() {
  return inject('baseUrl');
}

export interface Tab {
  context: BrowserContext;
  page: Page;
  /** Console errors and failed same-origin requests seen so far. */
  problems: string[];
}

export async function openTab(browser: Browser, viewport = DESKTOP): Promise<Tab> {
  const context = await browser.newContext({ viewport, baseURL: baseUrl() });
  const page = await context.newPage();
  const problems: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error') problems.push(`console: ${m.text()}`);
  });
  page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
  return { context, page, problems };
}

/** Signs in through the form, as a person would. */
export async function signInWithForm(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}
