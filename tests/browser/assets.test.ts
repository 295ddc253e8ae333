// In Chromium on a phone-sized screen, as if a valve's QR label had just been scanned: the
// technician opens the applicator's page, starts a walk from it with the valve recorded, walks the
// demo guide to the worn-seat Finding, says "fixed", records the service the walk offers
// (prefilled), and finds it in the applicator's history with the walk linked.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PHONE, launch, openTab, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

describe('scan to fix on a phone', () => {
  it('when a technician opens an applicator from its label, walks to a fix and records the service, then the history shows it with the walk', async () => {
    const tab = await openTab(browser, PHONE);
    const { page } = tab;
    await signInWithForm(page, 'tech@example.com');
    await page.getByRole('heading', { name: 'What are you seeing?' }).waitFor();
    const found = await (await page.request.get('/api/applicators?q=V-313')).json();
    const applicator = found.applicators.find((a: { tag: string }) => a.tag === 'V-313');
    expect(applicator).toBeTruthy();

    // The label's code is the page's address.
    await page.goto(`/applicators/${applicator.id}`);
    await page.getByRole('heading', { name: 'V-313', level: 1 }).waitFor();
    await page.getByRole('link', { name: 'Drips or drool after the valve closes' }).click();
    await page.getByText('Recorded on').waitFor();
    await expect(page.getByLabel('Valve (tag on the label)').count()).resolves.toBe(0);
    await page.getByRole('button', { name: 'Start walk' }).click();
    await page.waitForURL(/\/walks\/\d+$/);
    const walkId = Number(/walks\/(\d+)/.exec(page.url())![1]);

    await page.getByRole('button', { name: 'It seeps steadily between shots' }).click();
    await page.getByRole('heading', { name: 'Clean the seat and the needle tip' }).waitFor();
    await page.getByRole('button', { name: 'I have done this' }).click();
    await page.getByRole('button', { name: 'Not fixed' }).click();
    await page.getByRole('button', { name: 'A shiny ring or groove worn into the seat' }).click();
    await page.getByRole('heading', { name: 'Worn seat' }).waitFor();
    await page.getByRole('button', { name: 'Fixed', exact: true }).click();
    await page.getByRole('heading', { name: 'Fixed', level: 1 }).waitFor();

    await page.getByRole('link', { name: 'Record service event' }).click();
    await page.getByRole('heading', { name: 'Record service on V-313' }).waitFor();
    expect(await page.getByRole('checkbox', { name: 'Seat replaced' }).isChecked()).toBe(true);
    expect(await page.getByRole('checkbox', { name: 'It was a failure (not planned)' }).isChecked()).toBe(true);
    await page.locator('option[value="seat-worn"]').waitFor({ state: 'attached' });
    expect(await page.getByLabel('Cause').inputValue()).toBe('seat-worn');
    await page.getByRole('button', { name: 'Add a part' }).click();
    await page.getByLabel('Part', { exact: true }).fill('Seat kit, 0.8 mm');
    await page.getByLabel('Part number').fill('LK-SK-08');
    await page.getByRole('button', { name: 'Record service' }).click();

    await page.waitForURL(new RegExp(`/applicators/${applicator.id}$`));
    const history = page.getByTestId('service-history');
    await history.getByText('Seat replaced').first().waitFor();
    await expect(history.getByText('1 × Seat kit, 0.8 mm (LK-SK-08)').count()).resolves.toBe(1);
    await expect(history.getByRole('link', { name: 'the walk that led to it' }).first().getAttribute('href')).resolves.toBe(`/walks/${walkId}/summary`);

    const page2 = (await (await page.request.get(`/api/applicators/${applicator.id}`)).json()).applicator;
    const event = page2.serviceEvents.find((e: { walkId: number | null }) => e.walkId === walkId);
    expect(event).toMatchObject({ actions: ['seat-replaced'], causeCode: 'seat-worn', performedBy: 'Dario Lindqvist' });
    expect(page2.walks.map((w: { id: number }) => w.id)).toContain(walkId);
    const walk = (await (await page.request.get(`/api/walks/${walkId}`)).json()).walk;
    expect(walk).toMatchObject({ applicatorId: applicator.id, applicator: 'V-313', line: 'Line 3 (carton sealing)', site: 'Mill Road plant', outcome: 'fixed', causeCode: 'seat-worn' });
    expect(tab.problems).toEqual([]);
    await tab.context.close();
  });
});
