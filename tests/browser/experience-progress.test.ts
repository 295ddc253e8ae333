// Waiting and empty screens on a phone: a slow list shows its skeleton, an empty search says what
// to do and offers it, and a photo upload shows how far it has got in percent.
import sharp from 'sharp';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PHONE, launch, openTab, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

describe('progress, skeletons and empty states', () => {
  it('when the guide list is slow, then a skeleton stands in; when a search finds nothing, then the page offers to clear it', async () => {
    const tab = await openTab(browser, PHONE);
    const { page } = tab;
    await signInWithForm(page, 'tech@example.com');
    await page.waitForURL((u) => u.pathname === '/');
    let release!: () => void;
    const held = new Promise<void>((r) => (release = r));
    await page.route(/\/api\/guides\?/, async (route) => {
      await held;
      await route.continue();
    });
    await page.goto('/guides');
    const skeleton = page.getByRole('status', { name: 'Loading guides' });
    await skeleton.waitFor();
    release();
    await page.getByRole('heading', { level: 2, name: 'No flow from the valve' }).waitFor();
    expect(await skeleton.count()).toBe(0);
    await page.unroute(/\/api\/guides\?/);

    await page.goto('/guides?q=zzqxjv');
    await page.getByText('No guide matches').waitFor();
    await page.getByRole('button', { name: 'Clear the search' }).click();
    await page.getByRole('heading', { level: 2, name: 'No flow from the valve' }).waitFor();
    expect(new URL(page.url()).searchParams.get('q')).toBeNull();
    expect(tab.problems).toEqual([]);
    await tab.context.close();
  });

  it('when a technician adds a photo to a walk note, then the button shows the upload in percent and the photo appears', async () => {
    const tab = await openTab(browser, PHONE);
    const { page } = tab;
    await signInWithForm(page, 'tech@example.com');
    await page.waitForURL((u) => u.pathname === '/');
    const walkId = await page.evaluate(async () => {
      const list = (await (await fetch('/api/guides?status=published')).json()) as { guides: { id: number; title: string }[] };
      const guideId = list.guides.find((g) => g.title === 'No flow from the valve')!.id;
      const res = await fetch('/api/walks', { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ guideId, line: 'Line 9' }) });
      return ((await res.json()) as { walk: { id: number } }).walk.id;
    });
    await page.goto(`/walks/${walkId}`);
    await page.getByRole('button', { name: 'Note or photo' }).click();
    const dialog = page.getByRole('dialog', { name: 'Note or photo' });
    await dialog.waitFor();

    // Every label the photo button shows, in order.
    await page.evaluate(() => {
      const seen: string[] = [];
      (window as unknown as { uploadLabels: string[] }).uploadLabels = seen;
      new MutationObserver(() => {
        const t = document.querySelector('dialog[open] [data-upload-progress]')?.textContent;
        if (t && seen[seen.length - 1] !== t) seen.push(t);
      }).observe(document.body, { subtree: true, childList: true, characterData: true, attributes: true });
    });
    const png = await sharp({ create: { width: 640, height: 480, channels: 3, background: { r: 180, g: 120, b: 40 } } })
      .png()
      .toBuffer();
    await dialog.locator('input[type=file]').setInputFiles({ name: 'seat.png', mimeType: 'image/png', buffer: png });
    await dialog.getByRole('img', { name: 'Photo added to the note' }).waitFor();
    const labels = await page.evaluate(() => (window as unknown as { uploadLabels: string[] }).uploadLabels);
    expect(labels.length).toBeGreaterThan(0);
    for (const l of labels) expect(l).toMatch(/^Uploading the photo… \d{1,3}%$/);
    expect(await dialog.getByText('Take or add a photo').isVisible()).toBe(true);
    expect(tab.problems).toEqual([]);
    await tab.context.close();
  });

  it('when an admin imports a sites CSV, then it is sent with progress, checked, and imported with the stages shown on the way', async () => {
    const tab = await openTab(browser, PHONE);
    const { page } = tab;
    await signInWithForm(page, 'admin@example.com');
    await page.waitForURL((u) => u.pathname === '/');
    await page.goto('/applicators/import');
    await page.getByText('Sites', { exact: true }).click();
    // Every stage list the page shows on the way, as text.
    await page.evaluate(() => {
      const seen: string[] = [];
      (window as unknown as { stages: string[] }).stages = seen;
      new MutationObserver(() => {
        for (const el of document.querySelectorAll('[data-import-progress]')) {
          const t = (el as HTMLElement).innerText;
          if (!seen.includes(t)) seen.push(t);
        }
      }).observe(document.body, { subtree: true, childList: true, characterData: true });
    });
    const csv = 'Site,Address or area,Contact\nHarbour Road works,Dock 4,Ines Varga\nMill Lane plant,,\n';
    await page.getByLabel('CSV file to import').setInputFiles({ name: 'sites.csv', mimeType: 'text/csv', buffer: Buffer.from(csv, 'utf8') });
    await page.getByText('2 rows read', { exact: false }).waitFor();
    await page.getByRole('button', { name: 'Import all 2 rows' }).click();
    await page.getByText('Imported 2 rows of sites').waitFor();
    const stages = await page.evaluate(() => (window as unknown as { stages: string[] }).stages);
    expect(stages.some((t) => /Check every row/.test(t))).toBe(true);
    expect(stages.some((t) => /Import every row, or none if one fails/.test(t))).toBe(true);
    expect(tab.problems).toEqual([]);
    await tab.context.close();
  });
});
