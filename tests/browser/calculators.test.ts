// In Chromium: a technician works a calculator on a phone, results follow the typing, warnings
// show, output units switch, and the shared link brings the same inputs back.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PHONE, launch, openTab, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

describe('calculator pages', () => {
  it('when a technician fills in the nozzle-flow calculator, then the result appears as they type and the link restores it', async () => {
    const tab = await openTab(browser, PHONE);
    const { page } = tab;
    await signInWithForm(page, 'tech@example.com');
    await page.getByRole('heading', { name: /Good to see you/ }).waitFor();
    await page.goto('/calculators');
    await page
      .getByRole('link', { name: /Needle flow \(Newtonian/ })
      .first()
      .click();
    await page.getByText('Fill in the inputs to see the result').waitFor();

    await page.getByLabel('Inner diameter', { exact: true }).fill('0.41');
    await page.getByLabel('Needle length', { exact: true }).fill('12.7');
    await page.getByLabel('Viscosity', { exact: true }).fill('1000');
    await page.getByLabel('Unit of viscosity').selectOption('cP');
    await page.getByLabel(/^Pressure drop/).fill('2');
    await page.getByLabel('Unit of pressure drop').selectOption('bar');
    const flow = page.locator('[data-output="flowRate"]');
    await flow.waitFor();
    await page.getByLabel('Show flow rate in').selectOption('uL/s');
    await expect.poll(() => flow.textContent()).toBe('10.922');

    // Thin fluid: the formula no longer holds and the page says so.
    await page.getByLabel(/^Density/).fill('1');
    await page.getByLabel('Viscosity', { exact: true }).fill('1');
    await page.locator('[data-warning="turbulent"]').waitFor();

    // The address carries the inputs: a colleague opening it sees the same thing.
    await page.getByLabel('Viscosity', { exact: true }).fill('1000');
    await expect.poll(() => flow.textContent()).toBe('10.922');
    const link = page.url();
    expect(link).toContain('innerDiameter=0.41');
    const other = await openTab(browser, PHONE);
    await signInWithForm(other.page, 'support@example.com');
    await other.page.getByRole('heading', { name: /Good to see you/ }).waitFor();
    await other.page.goto(link);
    await expect.poll(() => other.page.locator('[data-output="flowRate"]').textContent()).toBe('10.922');
    expect(await other.page.getByLabel('Inner diameter', { exact: true }).inputValue()).toBe('0.41');

    expect(tab.problems).toEqual([]);
    expect(other.problems).toEqual([]);
    await tab.context.close();
    await other.context.close();
  });

  it('when a coil reads low for its temperature, then the verdict says shorted turns and an impossible entry is named', async () => {
    const tab = await openTab(browser, PHONE);
    const { page } = tab;
    await signInWithForm(page, 'tech@example.com');
    await page.getByRole('heading', { name: /Good to see you/ }).waitFor();
    await page.goto('/calculators/coil-check');
    await page.getByLabel('Supply voltage', { exact: true }).fill('24');
    await page.getByLabel('Nominal resistance', { exact: true }).fill('28.8');
    await page.getByLabel('Measured resistance', { exact: true }).fill('25');
    await page.getByLabel('Coil temperature at measurement', { exact: true }).fill('35');
    await page.locator('[data-output="verdict"]', { hasText: 'shorted turns' }).waitFor();
    await page.getByLabel('Measured resistance', { exact: true }).fill('-3');
    await page.getByText(/Measured resistance must be/).waitFor();
    expect(tab.problems).toEqual([]);
    await tab.context.close();
  });
});
