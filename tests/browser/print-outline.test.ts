// A guide outline printed for the binder at the line: from the guide page's "Print outline", the
// print view lists every step of the published version with its kind, cautions in full, the
// version and the safety line, and under print media the navigation, header and footer are gone.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DESKTOP, launch, openTab, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

interface GuideContent {
  steps: { id: string; kind: string; title: string; cautions: { text: string; action: string }[] }[];
}

describe('printing a guide outline', () => {
  it('when a technician prints a published guide, then every step is there in print media with its cautions and no navigation', async () => {
    const tab = await openTab(browser, DESKTOP);
    const { page } = tab;
    await signInWithForm(page, 'tech@example.com');
    await page.waitForURL((u) => u.pathname === '/');
    const guide = await page.evaluate(async () => {
      const list = (await (await fetch('/api/guides?status=published')).json()) as { guides: { id: number; title: string }[] };
      const g = list.guides.find((x) => x.title === 'No flow from the valve')!;
      const detail = (await (await fetch(`/api/guides/${g.id}`)).json()) as { guide: { published: { number: number; content: unknown } } };
      return { id: g.id, number: detail.guide.published.number, content: detail.guide.published.content };
    });
    const content = guide.content as GuideContent;

    await page.goto(`/guides/${guide.id}`);
    await page.getByRole('link', { name: 'Print outline' }).click();
    await page.waitForURL(`**/guides/${guide.id}/print`);
    await page.getByRole('list', { name: 'Steps in outline order' }).waitFor();

    await page.emulateMedia({ media: 'print' });
    const printed = await page.locator('[data-print-step]').evaluateAll((els) =>
      els.map((el) => ({
        id: el.getAttribute('data-print-step'),
        kind: el.querySelector('[data-kind]')?.textContent,
        text: (el as HTMLElement).innerText,
        breakInside: getComputedStyle(el).breakInside,
      })),
    );
    // Every step once, nothing invented.
    expect(printed.map((p) => p.id).sort()).toEqual(content.steps.map((s) => s.id).sort());
    expect(printed[0].text).toContain('Step 1');
    for (const step of content.steps) {
      const p = printed.find((x) => x.id === step.id)!;
      expect(p.text).toContain(step.title);
      expect(p.kind).toBeTruthy();
      for (const c of step.cautions) {
        expect(p.text).toContain(c.text);
        expect(p.text).toContain(c.action);
      }
      // A step is never split across two sheets.
      expect(p.breakInside).toBe('avoid');
    }
    expect(content.steps.some((s) => s.cautions.length > 0)).toBe(true);
    expect(await page.getByTestId('print-version').isVisible()).toBe(true);
    expect(await page.getByRole('heading', { level: 1, name: 'No flow from the valve' }).isVisible()).toBe(true);
    expect(await page.getByTestId('print-version').innerText()).toContain(`Version ${guide.number}`);
    expect(await page.getByRole('note').innerText()).toMatch(/local codes.*site.*maker.*manual/s);

    // Navigation, header, footer and the print button itself are hidden on paper.
    for (const selector of ['header', 'footer', 'nav', '.no-print']) {
      const visible = await page.locator(selector).evaluateAll((els) => els.filter((el) => (el as HTMLElement).offsetParent !== null || getComputedStyle(el).display !== 'none').length);
      expect(visible, selector).toBe(0);
    }
    await page.emulateMedia({ media: 'screen' });
    expect(await page.locator('header').first().isVisible()).toBe(true);

    // It lays out on both paper sizes (headless Chromium renders the PDF).
    for (const format of ['A4', 'Letter'] as const) {
      const pdf = await page.pdf({ format, printBackground: false });
      expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
      const pages = (pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length;
      expect(pages, format).toBeGreaterThan(1);
    }
    expect(tab.problems).toEqual([]);
    await tab.context.close();
  });
});
