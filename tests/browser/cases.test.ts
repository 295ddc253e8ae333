// In Chromium: the support desk logs a call, walks the drips guide with the caller through the
// nozzle temperature and its heat caution to a finding that does not fix it, hands the case to the
// senior technician, who finds it from the notice on their phone's home page.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DESKTOP, PHONE, launch, openTab, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

describe('taking a call', () => {
  it('when support logs a call, walks a guide with the caller and hands off, then the senior technician sees the case', async () => {
    const desk = await openTab(browser, DESKTOP);
    const { page } = desk;
    await signInWithForm(page, 'support@example.com');
    await page.getByRole('link', { name: 'Log a call' }).first().click();
    await page.getByRole('heading', { name: 'Log a call' }).waitFor();

    // Half a case is refused with the fields named, before anything is sent.
    await page.getByRole('button', { name: 'Log the call' }).click();
    await page.getByText("Give the caller's name or their company").waitFor();
    await page.getByText('Say which site the call is about, or pick a registered valve').waitFor();

    await page.getByLabel('Name', { exact: true }).fill('Ada Penhallow');
    await page.getByLabel('Company').fill('Tilbury Cartons (demo)');
    await page.getByLabel('Phone').fill('+44 1632 960 777');
    await page.getByLabel('E-mail').fill('ada.penhallow@example.net');
    await page.getByLabel('Site').fill('Tilbury works');
    await page.getByLabel('Line').fill('Line 4');
    await page.getByLabel('What do they see?').fill('Hot melt keeps dripping from the nozzle when the line stops');
    await page.getByLabel('High').check();
    await page.getByRole('button', { name: 'Log the call' }).click();
    await page.waitForURL(/\/cases\/\d+$/);
    const caseId = Number(/cases\/(\d+)/.exec(page.url())![1]);
    await page.getByRole('heading', { name: 'Hot melt keeps dripping from the nozzle when the line stops' }).waitFor();

    // Walk the guide with the caller, in the ordinary runner.
    await page.getByLabel('What does the caller see?').fill('drips after the valve closes');
    await page.getByRole('button', { name: /Drips or drool after the valve closes/ }).click();
    await page.waitForURL(/\/walks\/\d+$/);
    const walkId = Number(/walks\/(\d+)/.exec(page.url())![1]);
    await page.getByRole('button', { name: 'Mostly after the line stops, while the valve stays hot' }).click();
    await page.getByRole('heading', { name: 'Measure the nozzle temperature with a contact thermometer' }).waitFor();
    await page.getByRole('button', { name: 'I have done this' }).click();
    await page.getByLabel('Nozzle temperature', { exact: true }).fill('200');
    await page.locator('[data-band]').waitFor();
    await page.getByRole('button', { name: 'Use this reading' }).click();
    await page.getByRole('heading', { name: 'Hot melt expanding in an overheated nozzle' }).waitFor();
    await page.getByRole('button', { name: 'I have done this' }).click();
    await page.getByRole('button', { name: 'Not fixed', exact: true }).click();
    await page.getByRole('heading', { name: 'Not fixed', level: 1 }).waitFor();
    await page.locator('[data-sync="saved"]').waitFor({ timeout: 30_000 });

    // Back on the case: the walk is there, ended not fixed, and the desk hands off.
    await page.getByRole('link', { name: 'Cases' }).first().click();
    await page.locator(`a[href="/cases/${caseId}"]`).first().click();
    await page.locator(`[data-walk="${walkId}"]`).getByText('Not fixed').waitFor();
    await page.getByText('The remedy did not fix it').waitFor();
    await page.getByRole('button', { name: 'Hand off' }).first().click();
    const dialog = page.getByRole('dialog', { name: 'Hand off the case' });
    await dialog.getByLabel('Hand to').selectOption({ label: 'Walt Brennan (author, technician)' });
    await dialog.getByLabel('What should they know?').fill('Nozzle reads 200 °C after a stop; the setting change did not help. Please call Ada before 3 pm.');
    await dialog.getByRole('button', { name: 'Hand off' }).click();
    await page.locator('[data-status="handed-off"]').first().waitFor();
    await page.locator('[data-event="handoff"]').getByText('handed it to Walt Brennan').waitFor();
    await page.locator('[data-event="email"]').getByText('Hand-off notice to Walt Brennan').waitFor();
    expect(desk.problems).toEqual([]);
    await desk.context.close();

    // The senior technician, on a phone, finds it from the notice on the home page.
    const senior = await openTab(browser, PHONE);
    await signInWithForm(senior.page, 'author@example.com');
    const notice = senior.page.getByRole('link', { name: `Case ${caseId} handed to you by Nell Fairweather` });
    await notice.click();
    await senior.page.waitForURL(new RegExp(`/cases/${caseId}$`));
    await senior.page.getByRole('heading', { name: 'Hot melt keeps dripping from the nozzle when the line stops' }).waitFor();
    await senior.page.getByText('Assigned to').getByText('Walt Brennan').waitFor();
    await senior.page.getByText('Nozzle reads 200 °C after a stop; the setting change did not help. Please call Ada before 3 pm.').waitFor();
    await senior.page.locator(`[data-walk="${walkId}"]`).getByRole('link', { name: 'The record' }).click();
    await senior.page.waitForURL(new RegExp(`/walks/${walkId}/summary$`));
    await senior.page.getByText('Above 185 °C').first().waitFor();

    const list = await senior.page.request.get('/api/cases?assignee=me');
    expect((await list.json()).cases.map((c: { id: number }) => c.id)).toContain(caseId);
    expect(senior.problems).toEqual([]);
    await senior.context.close();
  });
});
