// Every main page, as the role that uses it, on a phone and a desktop: no serious or critical
// accessibility problem found by axe-core (WCAG 2.0 to 2.2, levels A and AA).
import { AxeBuilder } from '@axe-core/playwright';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, DESKTOP, PHONE, baseUrl, launch } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

const PAGES: Record<string, string[]> = {
  'tech@example.com': ['/', '/guides', '/guides/1', '/guides/1/walk', '/articles', '/articles/1', '/calculators', '/calculators/coil-check', '/applicators', '/search?q=drips', '/account'],
  'author@example.com': ['/', '/guides/1/edit', '/articles/1/edit', '/articles/1/history'],
  'support@example.com': ['/', '/cases', '/cases/new'],
  'manager@example.com': ['/'],
  'admin@example.com': ['/admin/users', '/admin/settings', '/admin/outbox', '/admin/search'],
};

describe('accessibility', () => {
  for (const [email, urls] of Object.entries(PAGES)) {
    it(`when ${email} opens each of their pages, then axe finds no serious or critical violation`, async () => {
      const found: string[] = [];
      for (const viewport of [PHONE, DESKTOP]) {
        const context = await browser.newContext({ viewport, baseURL: baseUrl() });
        await context.request.post('/api/auth/login', { data: { email, password: DEMO_PASSWORD }, headers: { Origin: baseUrl() } });
        const page = await context.newPage();
        for (const url of urls) {
          await page.goto(url, { waitUntil: 'networkidle' });
          const result = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa']).analyze();
          for (const v of result.violations.filter((x) => x.impact === 'serious' || x.impact === 'critical')) {
            found.push(`${viewport.width}px ${url}: ${v.id} (${v.nodes.length}) ${v.nodes[0]?.target.join(' ')}`);
          }
        }
        await context.close();
      }
      expect(found).toEqual([]);
      // Up to 22 page loads with an axe pass each; a busy machine pushes that past the default minute.
    }, 150_000);
  }
});
