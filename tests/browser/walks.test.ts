// In Chromium on a phone-sized screen: a technician walks the demo guide through cautions, an
// Ask, plain readings and a reading worked out with the coil calculator to a Finding, marks it
// fixed; reloads half-way; loses the connection for two steps and the server still gets every
// answer, in order.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PHONE, launch, openTab, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

describe('walking a guide on a phone', () => {
  it('when a technician walks to a finding with a reload and a dropped connection, then the record is complete and in order', async () => {
    const tab = await openTab(browser, PHONE);
    const { page, context } = tab;
    await signInWithForm(page, 'tech@example.com');
    await page.getByRole('heading', { name: 'What are you seeing?' }).waitFor();
    await page.getByRole('link', { name: 'Drips or drool after the valve closes' }).click();
    await page.getByLabel('Line').fill('Line 3 (carton sealing)');
    await page.getByLabel('Valve (tag on the label)').fill('V-312');
    await page.getByRole('button', { name: 'Start walk' }).click();
    await page.waitForURL(/\/walks\/\d+$/);
    const walkId = Number(/walks\/(\d+)/.exec(page.url())![1]);

    await page.getByRole('button', { name: 'A drop forms right after every shot, then stops' }).click();
    await page.getByRole('heading', { name: 'Read the fluid pressure at the valve inlet with the line running' }).waitFor();
    await page.getByLabel('Fluid pressure at the valve inlet', { exact: true }).fill('4.2');
    await page.locator('[data-band]').waitFor();
    await page.getByRole('button', { name: 'Use this reading' }).click();

    // A Try with cautions: nothing can be answered before they are acknowledged.
    await page.getByRole('heading', { name: 'Purge trapped air from the valve' }).waitFor();
    expect(await page.getByRole('button', { name: 'Not fixed' }).isDisabled()).toBe(true);
    await page.getByRole('button', { name: 'I have done this' }).click();
    await page.getByRole('button', { name: 'Not fixed' }).click();
    await page.getByRole('heading', { name: 'Measure the voltage on the coil leads with the shot signal off' }).waitFor();
    await page.locator('[data-sync="saved"]').waitFor();

    // Reload half-way: the walk continues where it was.
    await page.reload();
    await page.getByRole('heading', { name: 'Measure the voltage on the coil leads with the shot signal off' }).waitFor();

    // Signal drops: two steps answered offline are kept and shown as waiting.
    await context.setOffline(true);
    await page.getByRole('button', { name: 'I have done this' }).click();
    await page.getByLabel('Voltage on the coil with the signal off', { exact: true }).fill('0.4');
    await page.getByRole('button', { name: 'Use this reading' }).click();
    await page.getByRole('heading', { name: 'Check the coil resistance against its nominal value' }).waitFor();
    await page.getByRole('button', { name: 'I have done this' }).click();
    await page.getByLabel('Coil resistance, leads disconnected', { exact: true }).fill('25');
    await page.getByLabel('Coil temperature at measurement', { exact: true }).fill('35');
    await page.locator('[data-output="deviation"]').waitFor();
    await page.getByRole('button', { name: 'Use this reading' }).click();
    await page.getByRole('heading', { name: 'Coil with shorted turns' }).waitFor();
    await page.locator('[data-sync="waiting"]').waitFor();

    await context.setOffline(false);
    await page.locator('[data-sync="saved"]').waitFor({ timeout: 30_000 });
    await page.getByRole('button', { name: 'Fixed', exact: true }).click();
    await page.getByRole('heading', { name: 'Fixed', level: 1 }).waitFor();
    await page.locator('[data-sync="saved"]').waitFor({ timeout: 30_000 });

    const res = await page.request.get(`/api/walks/${walkId}`);
    const walk = (await res.json()).walk;
    expect(walk.status).toBe('ended');
    expect(walk.outcome).toBe('fixed');
    expect(walk.causeCode).toBe('coil-shorted');
    expect(walk.line).toBe('Line 3 (carton sealing)');
    const log = walk.answers.map((a: { kind: string; stepId: string }) => `${a.kind}@${a.stepId}`);
    expect(log).toEqual([
      'choice@drip-when',
      'reading@fluid-pressure',
      'acknowledge@purge-air',
      'try@purge-air',
      'acknowledge@off-voltage',
      'reading@off-voltage',
      'acknowledge@coil-resistance',
      'reading@coil-resistance',
      'finding-outcome@finding-coil-shorted',
    ]);
    const coil = walk.answers.find((a: { stepId: string; kind: string }) => a.stepId === 'coil-resistance' && a.kind === 'reading');
    expect(coil.value).toBe(25);
    expect(coil.calculatorInputs.measuredAt).toEqual({ value: 35, unit: 'degC' });
    expect(walk.state.path.map((p: { stepId: string }) => p.stepId)).toEqual(['drip-when', 'fluid-pressure', 'purge-air', 'off-voltage', 'coil-resistance', 'finding-coil-shorted']);
    expect(tab.problems.filter((p) => !/ERR_INTERNET_DISCONNECTED|Failed to fetch|Failed to load resource/.test(p))).toEqual([]);
    await context.close();
  });
});
