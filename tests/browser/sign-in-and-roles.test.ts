// In Chromium against the built app: each demo role signs in and sees its own navigation; a wrong
// password shows an error; a technician is refused the admin page.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PHONE, launch, openTab, signInWithForm } from '../helpers/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => browser?.close());

const expectations: { email: string; sees: string[]; notSees: string[] }[] = [
  { email: 'admin@example.com', sees: ['Home', 'Calculators', 'Users'], notSees: [] },
  { email: 'author@example.com', sees: ['Home', 'Calculators'], notSees: ['Users'] },
  { email: 'tech@example.com', sees: ['Home', 'Calculators'], notSees: ['Users'] },
  { email: 'support@example.com', sees: ['Home', 'Calculators'], notSees: ['Users'] },
  { email: 'manager@example.com', sees: ['Home', 'Calculators'], notSees: ['Users'] },
];

describe('sign-in in the browser', () => {
  for (const e of expectations) {
    it(`when ${e.email} signs in, then the navigation shows what that role may open`, async () => {
      const tab = await openTab(browser);
      await signInWithForm(tab.page, e.email);
      const nav = tab.page.getByRole('navigation', { name: 'Main' });
      await nav.getByRole('link', { name: 'Home' }).waitFor();
      // Entries past the first few sit under "More", closed: count them too.
      for (const label of e.sees) expect(await nav.getByRole('link', { name: label, exact: true, includeHidden: true }).count(), label).toBe(1);
      for (const label of e.notSees) expect(await nav.getByRole('link', { name: label, exact: true, includeHidden: true }).count(), label).toBe(0);
      expect(tab.problems).toEqual([]);
      await tab.context.close();
    });
  }

  it('when the password is wrong, then the form says so and stays on sign-in', async () => {
    const tab = await openTab(browser);
    await signInWithForm(tab.page, 'tech@example.com', 'not the demo password');
    await tab.page.getByRole('alert').filter({ hasText: 'E-mail or password is not correct' }).waitFor();
    expect(new URL(tab.page.url()).pathname).toBe('/sign-in');
    expect(tab.problems.filter((p) => !/status of 401/.test(p))).toEqual([]);
    await tab.context.close();
  });

  it('when a technician opens the admin page by its address, then it is refused and no user list is shown', async () => {
    const tab = await openTab(browser, PHONE);
    await signInWithForm(tab.page, 'tech@example.com');
    await tab.page.getByRole('heading', { name: /Good to see you/ }).waitFor();
    await tab.page.goto('/admin/users');
    await tab.page.getByRole('heading', { name: 'Your roles do not open this page' }).waitFor();
    expect(await tab.page.getByText('admin@example.com').count()).toBe(0);
    const api = await tab.page.request.get('/api/admin/users');
    expect(api.status()).toBe(403);
    await tab.context.close();
  });

  it('when a person with two roles signs in, then they land on the first role\u2019s home and can switch', async () => {
    const tab = await openTab(browser, PHONE);
    await signInWithForm(tab.page, 'author@example.com');
    const group = tab.page.getByRole('group', { name: 'Show the home page of' });
    await group.waitFor();
    expect(await group.getByRole('button', { name: 'Author' }).getAttribute('aria-pressed')).toBe('true');
    await group.getByRole('button', { name: 'Technician' }).click();
    expect(await group.getByRole('button', { name: 'Technician' }).getAttribute('aria-pressed')).toBe('true');
    await tab.context.close();
  });

  it('when someone not signed in opens a page, then they go to sign-in and come back after it', async () => {
    const tab = await openTab(browser);
    await tab.page.goto('/calculators');
    await tab.page.waitForURL(/\/sign-in\?next=/);
    await tab.page.getByLabel('E-mail').fill('manager@example.com');
    await tab.page.getByLabel('Password').fill('beadpath-demo');
    await tab.page.getByRole('button', { name: 'Sign in' }).click();
    await tab.page.waitForURL(/\/calculators$/);
    await tab.page.getByRole('heading', { name: 'Calculators', level: 1 }).waitFor();
    expect(tab.problems).toEqual([]);
    await tab.context.close();
  });
});
