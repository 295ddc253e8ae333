// In Chromium: an author builds a guide in the outline (an Ask, a Measure with three bands, a Try
// and two Findings), sees it on the map, fixes a problem the editor shows, submits; a second
// author approves and publishes it.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launch, openTab, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

const row = (page: Page, text: RegExp | string) => page.getByRole('treeitem').filter({ hasText: text }).first();

describe('guide editor', () => {
  it('when an author builds, checks and submits a guide and another author approves, then it is published', async () => {
    const stamp = Date.now();
    const title = `Skips in the bead ${stamp}`;
    const author = await openTab(browser);
    const { page } = author;
    await signInWithForm(page, 'author@example.com');
    await page.getByRole('heading', { name: /Good to see you/ }).waitFor();
    await page.goto('/guides');
    await page.getByRole('button', { name: 'New guide' }).click();
    await page.getByLabel('Symptom it starts from').fill(`Bead skips on the flap ${stamp}`);
    await page.getByLabel('Title').fill(title);
    await page.getByRole('button', { name: 'Create and edit' }).click();
    await page.waitForURL(/\/guides\/\d+\/edit$/);
    const guideId = Number(/guides\/(\d+)/.exec(page.url())![1]);

    // The start step: a question with two answers, each leading to a new step (Tab).
    const question = page.getByLabel('Question', { exact: true });
    await question.fill('Does the air gauge at the valve stay steady while the valve fires?');
    const start = row(page, 'Does the air gauge');
    await start.click();
    await start.press('Tab');
    await start.press('Tab');
    await start.click();
    await page.getByLabel('Answer 1', { exact: true }).fill('Yes, steady');
    await page.getByLabel('Answer 2', { exact: true }).fill('No, it dips');

    // First new step: a Measure (key M) with three bands.
    await row(page, 'Yes, steady').click();
    await row(page, 'Yes, steady').press('m');
    await page.getByLabel('What to measure', { exact: true }).fill('Read the air pressure at the valve');
    await page.getByLabel('Reading label', { exact: true }).fill('Air pressure at the valve');
    await page.getByLabel('Quantity', { exact: true }).selectOption('pressure');
    await page.getByLabel('Unit asked for', { exact: true }).selectOption('bar');
    await page.getByLabel('Band 1 name', { exact: true }).fill('Below 4 bar');
    await page.getByLabel('Band 1 upper limit', { exact: true }).fill('4');
    await page.getByLabel('Band 2 name', { exact: true }).fill('4 to 7 bar');
    await page.getByLabel('Band 2 lower limit', { exact: true }).fill('4');
    await page.getByLabel('Band 2 upper limit', { exact: true }).fill('7');
    await page.getByRole('button', { name: 'Add a band' }).click();
    await page.getByLabel('Band 3 name', { exact: true }).fill('Above 7 bar');
    await page.getByLabel('Band 3 lower limit', { exact: true }).fill('7');
    // The second band overlaps nothing yet leaves 7 itself out: the editor says so.
    await page.getByText(/gap/i).first().waitFor();
    await page.locator('label', { hasText: '(incl.)' }).nth(3).locator('input').check();
    await page.getByLabel('Next step for band “Below 4 bar”').selectOption('__new');
    await page.getByLabel('Next step for band “4 to 7 bar”').selectOption('__new');
    await page.getByLabel('Next step for band “Above 7 bar”').selectOption({ index: 0 });

    // Second answer: a Try (key T).
    await row(page, 'No, it dips').click();
    await row(page, 'No, it dips').press('t');
    await page.getByLabel('What to try (short)', { exact: true }).fill('Shorten the air line to the valve');
    await page.getByLabel('What to do', { exact: true }).fill('Move the air valve to within 0.5 m of the gun and refit.');

    // The two new steps from the bands become Findings (key F) and get their details.
    for (const [band, cause, words] of [
      ['Below 4 bar', 'air-pressure-low', 'Air supply too low for the spring'],
      ['4 to 7 bar', 'exhaust-restricted', 'Slow exhaust keeps the valve from closing cleanly'],
    ] as const) {
      const r = row(page, band);
      await r.click();
      await r.press('f');
      await page.getByLabel('Finding (short)', { exact: true }).fill(words);
      await page.getByLabel('Cause (for counting across guides)').selectOption(cause);
      await page.getByLabel('Probable cause, in words', { exact: true }).fill(words);
      await page.getByLabel('Remedy, one step per line', { exact: true }).fill('Lock out and relieve air\nFix the cause\nTest ten shots');
    }
    // Route the third band and the Try to those findings.
    await row(page, 'Read the air pressure').click();
    await page.getByLabel('Next step for band “Above 7 bar”').selectOption({ label: 'Finding: Slow exhaust keeps the valve from closing cleanly' });
    await row(page, 'Shorten the air line').click();
    await page.getByLabel('Next step when not fixed').selectOption({ label: 'Finding: Air supply too low for the spring' });

    // Everything is connected and every problem fixed: the editor says so and saves.
    await page.getByRole('heading', { name: /Ready for review/ }).waitFor();
    await page.locator('[data-save-status="saved"]').waitFor({ timeout: 15000 });

    await page.getByRole('tab', { name: 'Map' }).click();
    await expect.poll(() => page.locator('.react-flow__node').count()).toBe(5);
    await page.getByRole('button', { name: 'Submit for review' }).click();
    await page.waitForURL(new RegExp(`/guides/${guideId}$`));
    await page.getByText(/waiting for review/).waitFor();
    expect(author.problems).toEqual([]);
    await author.context.close();

    const reviewer = await openTab(browser);
    await signInWithForm(reviewer.page, 'author2@example.com');
    await reviewer.page.getByRole('heading', { name: /Good to see you/ }).waitFor();
    await reviewer.page.goto(`/guides/${guideId}`);
    await reviewer.page.getByRole('button', { name: 'Approve and publish' }).click();
    await reviewer.page.getByText(/Version 1 is published/).waitFor();
    expect(reviewer.problems).toEqual([]);
    await reviewer.context.close();

    // A technician now sees it among the symptoms.
    const tech = await openTab(browser);
    await signInWithForm(tech.page, 'tech@example.com');
    await tech.page.getByRole('link', { name: `Bead skips on the flap ${stamp}` }).waitFor();
    await tech.context.close();
  });
});
