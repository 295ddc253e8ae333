// In Chromium with the demo data: a technician types a misspelt symptom on the home page on a
// phone and starts the top guide's walk with one tap; on a desktop, "/" jumps to the header box
// and results appear as they type.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DESKTOP, PHONE, launch, openTab, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

describe('searching in the browser', () => {
  it('when a technician types a misspelt symptom on the home page, then the matching guide is listed and one tap starts its walk', async () => {
    const { page, problems, context } = await openTab(browser, PHONE);
    await signInWithForm(page, 'tech@example.com');
    const box = page.getByLabel('Describe what you see');
    await box.waitFor();
    await box.fill('dripps aftr shutoff');
    const results = page.getByRole('list', { name: 'Matching guides' });
    await results.waitFor();
    const start = results.getByRole('link', { name: /^Start walk: Drips after the valve closes/ }).first();
    await start.waitFor();
    const box44 = await start.boundingBox();
    expect(box44!.height).toBeGreaterThanOrEqual(44);
    await start.click();
    await page.waitForURL(/\/guides\/\d+\/walk$/);
    await page.getByRole('button', { name: 'Start walk' }).waitFor();
    expect(problems).toEqual([]);
    await context.close();
  });

  it('when "/" is pressed on any page, then the header box takes the typing and shows results grouped by kind', async () => {
    const { page, problems, context } = await openTab(browser, DESKTOP);
    await signInWithForm(page, 'tech@example.com');
    await page.getByLabel('Describe what you see').waitFor();
    await page.goto('/calculators');
    await page.getByRole('heading', { level: 1 }).first().waitFor();
    await page.keyboard.press('/');
    await page.keyboard.type('loupe');
    const panel = page.getByRole('region', { name: 'Articles' });
    await panel.waitFor();
    await expect(panel.locator('mark').first().textContent()).resolves.toMatch(/loupe/i);
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/search\?q=loupe/);
    await page.getByRole('link', { name: 'Reading a worn seat under a loupe' }).waitFor();

    // Pressed the moment the page is drawn, before the box's own code has loaded: nothing typed is lost.
    await page.goto('/help');
    await page.getByRole('link', { name: 'Beadpath home' }).waitFor();
    const early = await page.evaluate(() => !document.querySelector('input[type="search"]'));
    await page.keyboard.press('/');
    await page.keyboard.type('loupe', { delay: 5 });
    console.info(`"/" pressed ${early ? 'before' : 'after'} the search box had loaded`);
    await expect(page.locator('header input[type="search"]').inputValue()).resolves.toBe('loupe');
    await page.getByRole('region', { name: 'Articles' }).waitFor();
    expect(problems).toEqual([]);
    await context.close();
  });
});
