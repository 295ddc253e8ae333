// In Chromium on a phone-sized screen: once the service worker controls the page, a technician who
// loses the signal can reload and still gets the app shell, the offline banner, and the guide and
// article read earlier.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PHONE, launch, openTab, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

// Requests for data never read before fail while offline; that is expected, not a fault.
const offlineNoise = /ERR_INTERNET_DISCONNECTED|ERR_FAILED|Failed to fetch|Failed to load resource/;

describe('using Beadpath without signal', () => {
  it('when the connection drops after a guide and an article were read, then a reload still shows the shell, the banner and both', async () => {
    const tab = await openTab(browser, PHONE);
    const { page, context } = tab;
    await signInWithForm(page, 'tech@example.com');
    await page.getByRole('heading', { name: /Good to see you/ }).waitFor();
    // Registered after load; controls the page once the shell is precached (clientsClaim).
    await page.waitForFunction(() => navigator.serviceWorker?.controller != null, undefined, { timeout: 30_000 });

    const guides = (await (await page.request.get('/api/guides')).json()) as { guides: { id: number; title: string }[] };
    const articles = (await (await page.request.get('/api/articles?status=published')).json()) as { articles: { id: number; title: string }[] };
    const guide = guides.guides[0];
    const article = articles.articles[0];
    expect(guide && article).toBeTruthy();

    // Read both while online, so their data passes through the service worker's cache.
    await page.goto(`/guides/${guide.id}`);
    await page.getByRole('heading', { name: guide.title, level: 1 }).waitFor();
    await page.goto(`/articles/${article.id}`);
    await page.getByRole('heading', { name: article.title, level: 1 }).waitFor();
    const before = tab.problems.length;

    await context.setOffline(true);
    await page.reload();
    await page
      .getByRole('navigation', { name: 'Main' })
      .or(page.getByRole('button', { name: 'Menu' }))
      .first()
      .waitFor();
    await page.getByText('No connection — walks keep your answers on this phone').waitFor();
    await page.getByRole('heading', { name: article.title, level: 1 }).waitFor();

    await page.goto(`/guides/${guide.id}`);
    await page.getByRole('heading', { name: guide.title, level: 1 }).waitFor();
    expect(tab.problems.slice(before).filter((p) => !offlineNoise.test(p))).toEqual([]);

    await context.setOffline(false);
    await page.getByText('No connection — walks keep your answers on this phone').waitFor({ state: 'detached' });
    expect(tab.problems.slice(0, before)).toEqual([]);
    await context.close();
  });
});
