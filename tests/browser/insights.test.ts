// In Chromium on a desktop screen: a manager opens insights on the demo data and finds the Pareto
// of recurring causes (with its table view), the service forecast table and a guide's effectiveness.
import { AxeBuilder } from '@axe-core/playwright';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { baseUrl, DEMO_PASSWORD, DESKTOP, launch, openTab, PHONE, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

describe('manager insights', () => {
  it('when a manager opens insights, then the Pareto chart, the forecast table and a guide’s effectiveness are shown', async () => {
    const { page } = await openTab(browser);
    await signInWithForm(page, 'manager@example.com');
    await page.getByRole('link', { name: 'Insights' }).first().click();
    await page.getByRole('heading', { name: 'Insights', level: 1 }).waitFor();

    const pareto = page.getByTestId('pareto');
    await pareto.getByRole('heading', { name: 'Recurring causes (Pareto)' }).waitFor();
    await expect(pareto.getByRole('img').getAttribute('aria-label')).resolves.toMatch(/^Pareto chart of \d+ causes/);
    await pareto.locator('.recharts-bar-rectangle').first().waitFor();
    await pareto.getByRole('button', { name: 'Show table' }).click();
    await expect(pareto.getByRole('columnheader', { name: 'Cumulative %' }).count()).resolves.toBe(1);
    await expect(pareto.getByRole('cell', { name: '100' }).count()).resolves.toBe(1);

    await page.getByRole('link', { name: 'Service forecast' }).click();
    const forecast = page.getByTestId('forecast-table');
    await forecast.getByRole('heading', { name: 'Services due in the next 90 days' }).waitFor();
    await expect(forecast.getByRole('columnheader', { name: 'Due' }).count()).resolves.toBe(1);

    await page.getByRole('link', { name: 'Guide effectiveness' }).click();
    const guides = page.getByTestId('guide-effectiveness');
    await guides.locator('li').first().waitFor();
    const first = guides.locator('li').first();
    await expect(first.getByText('Started').count()).resolves.toBe(1);
    await expect(first.getByText('Median time to a Finding').count()).resolves.toBe(1);
    await expect(page.getByText('NaN').count()).resolves.toBe(0);
  });

  it('when a manager opens the service forecast, then the month calendar is reached by keyboard, the page prints without navigation with the calendar on its own page, and the digest can be switched off and on', async () => {
    const { page, problems } = await openTab(browser);
    await signInWithForm(page, 'manager@example.com');
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
    await page.goto('/insights/forecast');
    const calendar = page.getByRole('region', { name: 'Calendar, next 90 days' });
    await calendar.getByRole('table').first().waitFor();
    await expect(page.getByTestId('freshness').getByRole('status').textContent()).resolves.toMatch(/^Figures (as of|read just now)/);

    const days = calendar.getByRole('button', { name: /services? due/ });
    const count = await days.count();
    expect(count).toBeGreaterThan(1);
    // One tab stop: only the first day with services is in the tab order.
    await expect(calendar.locator('button[tabindex="0"]').count()).resolves.toBe(1);
    const first = await days.nth(0).getAttribute('aria-label');
    expect(first).toMatch(/^.+: \d+ services? due, .+ (seat|needle|seals)/);
    await days.nth(0).focus();
    await page.keyboard.press('ArrowRight');
    const focused = await page.evaluate(() => document.activeElement?.getAttribute('aria-label'));
    expect(focused).toBe(await days.nth(1).getAttribute('aria-label'));
    await page.keyboard.press('Enter');
    await calendar.getByRole('heading', { name: /^Due / }).waitFor();
    await page.keyboard.press('End');
    expect(await page.evaluate(() => document.activeElement?.getAttribute('aria-label'))).toBe(await days.nth(count - 1).getAttribute('aria-label'));

    await page.emulateMedia({ media: 'print' });
    const printed = await page.evaluate(() => {
      const style = (el: Element | null) => (el ? getComputedStyle(el) : null);
      const row = document.querySelector('[data-testid="forecast-table"] tbody tr');
      return {
        header: style(document.querySelector('body > div header, header'))?.display,
        tabs: style(document.querySelector('nav[aria-label="Insights"]'))?.display,
        printButtonBoxes: [...document.querySelectorAll('button')].find((b) => b.textContent === 'Print')?.getClientRects().length,
        rowBreak: style(row)?.breakInside,
        calendarBreak: style(document.querySelector('[data-print="calendar"]'))?.breakBefore,
        table: style(document.querySelector('[data-testid="forecast-table"] table'))?.display,
      };
    });
    expect(printed).toEqual({ header: 'none', tabs: 'none', printButtonBoxes: 0, rowBreak: 'avoid', calendarBreak: 'page', table: 'table' });
    // Both paper sizes render.
    for (const format of ['A4', 'Letter'] as const) expect((await page.pdf({ format })).subarray(0, 4).toString()).toBe('%PDF');
    await page.emulateMedia({ media: 'screen' });

    const digest = page.getByRole('checkbox', { name: 'Send me the weekly digest' });
    await expect(digest.isChecked()).resolves.toBe(true);
    // The box follows the server's answer, so it changes once the switch is saved.
    await digest.click();
    await page.getByText('You will no longer get the weekly digest.').waitFor();
    await expect(digest.isChecked()).resolves.toBe(false);
    await digest.click();
    await page.getByText('You will get the weekly digest.').waitFor();
    await expect(digest.isChecked()).resolves.toBe(true);
    expect(problems).toEqual([]);
  });

  it('when the forecast is opened on a phone, then services are listed by day and the month grid is left out', async () => {
    const { page } = await openTab(browser, PHONE);
    await signInWithForm(page, 'manager@example.com');
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
    await page.goto('/insights/forecast');
    const list = page.getByRole('list', { name: 'Services by day' });
    await list.locator('li').first().waitFor();
    await expect(list.getByRole('heading', { level: 3 }).count()).resolves.toBeGreaterThan(0);
    await expect(page.getByRole('group', { name: /^Month view/ }).isVisible()).resolves.toBe(false);
  });

  it('when a manager opens each insights page on a phone and a desktop, then axe finds no serious or critical violation', async () => {
    const found: string[] = [];
    for (const viewport of [PHONE, DESKTOP]) {
      const context = await browser.newContext({ viewport, baseURL: baseUrl() });
      await context.request.post('/api/auth/login', { data: { email: 'manager@example.com', password: DEMO_PASSWORD }, headers: { Origin: baseUrl() } });
      const page = await context.newPage();
      for (const url of ['/insights', '/insights/forecast', '/insights/guides', '/insights/reliability']) {
        await page.goto(url, { waitUntil: 'networkidle' });
        const result = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa']).analyze();
        for (const v of result.violations.filter((x) => x.impact === 'serious' || x.impact === 'critical'))
          found.push(`${viewport.width}px ${url}: ${v.id} (${v.nodes.length}) ${v.nodes[0]?.target.join(' ')}`);
      }
      await context.close();
    }
    expect(found).toEqual([]);
  }, 120_000);
});
