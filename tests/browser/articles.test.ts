// In Chromium: an author writes an article with a photo and a caution and submits it, a second
// author approves it, a technician reads it on a phone; a page full of script vectors runs nothing.
import sharp from 'sharp';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { XSS_VECTORS } from '../fixtures/xss-vectors';
import { DEMO_PASSWORD, PHONE, baseUrl, launch, openTab, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

describe('articles in the browser', () => {
  it('when an author writes with a photo and a caution, a second author approves, then a technician reads it on a phone', async () => {
    const title = `Changing the seat of an electric valve ${Date.now()}`;
    const author = await openTab(browser);
    const { page } = author;
    await signInWithForm(page, 'author@example.com');
    await page.getByRole('heading', { name: /Good to see you/ }).waitFor();
    await page.goto('/articles/new');
    await page.getByLabel('Title').fill(title);
    await page.getByLabel('Summary').fill('Seat swap in ten minutes, without scratching the new one.');
    await page.getByRole('button', { name: 'Seat', exact: true }).click();
    const text = page.getByRole('textbox', { name: 'Article text' });
    await text.click();
    await page.keyboard.type('Relieve the fluid pressure at the tank before loosening the nozzle nut.');
    await page.getByRole('button', { name: 'Caution' }).click();
    await page.getByLabel('Hazard').selectOption('fluid-pressure');
    await page.getByRole('button', { name: 'Add caution' }).click();
    await page.keyboard.press('Control+End');
    await page.keyboard.press('Enter');
    await page.keyboard.press('Enter');
    await page.keyboard.type('Press the new seat in square with the seat tool.');

    const photo = await sharp({ create: { width: 320, height: 200, channels: 3, background: { r: 150, g: 120, b: 90 } } })
      .jpeg()
      .toBuffer();
    await page.getByLabel('Choose a photo').setInputFiles({ name: 'new-seat.jpg', mimeType: 'image/jpeg', buffer: photo });
    await page.getByLabel('What does the photo show?').fill('New stainless seat pressed into the body');
    await page.getByRole('button', { name: 'Add photo' }).click();
    await page.locator('.ProseMirror img[alt="New stainless seat pressed into the body"]').waitFor();

    // Autosave creates the draft and keeps it.
    await page.waitForURL(/\/articles\/\d+\/edit$/, { timeout: 15000 });
    await page.locator('[data-save-status="saved"]').waitFor({ timeout: 15000 });
    const id = Number(/articles\/(\d+)/.exec(page.url())![1]);
    await page.getByRole('button', { name: 'Done' }).click();
    await page.getByRole('button', { name: 'Submit for review' }).click();
    await page.getByText('In review', { exact: true }).waitFor();
    expect(author.problems).toEqual([]);
    await author.context.close();

    const reviewer = await openTab(browser);
    await signInWithForm(reviewer.page, 'author2@example.com');
    await reviewer.page.getByRole('heading', { name: /Good to see you/ }).waitFor();
    await reviewer.page.getByRole('region', { name: 'Waiting for your review' }).getByRole('link', { name: title }).click();
    await reviewer.page.getByRole('button', { name: 'Approve and publish' }).click();
    await reviewer.page.getByText('Published', { exact: true }).waitFor();
    expect(reviewer.problems).toEqual([]);
    await reviewer.context.close();

    const tech = await openTab(browser, PHONE);
    await signInWithForm(tech.page, 'tech@example.com');
    await tech.page.getByRole('heading', { name: /Good to see you/ }).waitFor();
    await tech.page.goto('/articles');
    await tech.page.getByRole('link', { name: new RegExp(title) }).click();
    await tech.page.getByRole('heading', { name: title, level: 1 }).waitFor();
    await tech.page.getByText('Caution: Fluid under pressure').waitFor();
    await tech.page.getByText(/Last reviewed .* by Priya Okafor/).waitFor();
    const img = tech.page.locator('.prose-bp img');
    await expect.poll(() => img.evaluate((el: HTMLImageElement) => el.complete && el.naturalWidth)).toBeGreaterThan(0);
    // Fits the phone screen: nothing wider than the viewport.
    expect(await tech.page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(PHONE.width);
    await img.click();
    await tech.page.getByRole('dialog', { name: 'New stainless seat pressed into the body' }).waitFor();
    expect(tech.problems).toEqual([]);
    await tech.context.close();
    expect(id).toBeGreaterThan(0);
  });

  it('when an article saved with script vectors is opened, then no script runs and no dialog appears', async () => {
    const ctx = await browser.newContext({ baseURL: baseUrl() });
    const api = ctx.request;
    const headers = { Origin: baseUrl() };
    await api.post('/api/auth/login', { data: { email: 'author@example.com', password: DEMO_PASSWORD }, headers });
    const para = (t: string) => ({ type: 'paragraph', content: [{ type: 'text', text: t }] });
    const nodes = XSS_VECTORS.flatMap((v) => [
      para(v),
      { type: 'paragraph', content: [{ type: 'text', text: 'link', marks: [{ type: 'link', attrs: { href: v } }] }] },
      { type: 'image', attrs: { src: v, alt: v } },
    ]);
    const res = await api.post('/api/articles', { data: { title: `Vectors ${Date.now()}`, body: { type: 'doc', content: nodes } }, headers });
    expect(res.status()).toBe(201);
    const { article } = await res.json();
    const page = await ctx.newPage();
    let dialogs = 0;
    page.on('dialog', (d) => {
      dialogs++;
      void d.dismiss();
    });
    await page.goto(`/articles/${article.id}`);
    await page.locator('.prose-bp').waitFor();
    // Hover and click over everything, in case a handler slipped through.
    for (const el of await page.locator('.prose-bp *').all()) await el.hover({ timeout: 500 }).catch(() => undefined);
    await page.waitForTimeout(300);
    expect(await page.evaluate(() => (window as unknown as { __xss?: number }).__xss)).toBeUndefined();
    expect(dialogs).toBe(0);
    await ctx.close();
  });
});
