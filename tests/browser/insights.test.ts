// In Chromium on a desktop screen: a manager opens insights on the demo data and finds the Pareto
// of recurring causes (with its table view), the service forecast table and a guide's effectiveness.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launch, openTab, signInWithForm } from '../helpers/browser';

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
});
