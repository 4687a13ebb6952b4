import Database from 'better-sqlite3';
import assert from 'node:assert/strict';
import path from 'node:path';
import { after, before, describe, it } from 'node:test';
import type { Browser } from 'playwright-core';
import { ACCOUNTS, BASE_URL, launch, newPage, PHONE, shot, signIn, WIDE } from './support';

const HOMES = [
  { role: 'nurse', email: ACCOUNTS.nurse, path: '/infants', heading: 'My infants' },
  { role: 'charge', email: ACCOUNTS.charge, path: '/board', heading: /board/i },
  { role: 'educator', email: ACCOUNTS.educator, path: '/review', heading: 'Review queue' },
  { role: 'admin', email: ACCOUNTS.admin, path: '/admin', heading: /admin/i },
] as const;

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

describe('foundation', () => {
  for (const size of [
    { name: 'phone', viewport: PHONE },
    { name: 'wide', viewport: WIDE },
  ]) {
    for (const home of HOMES) {
      it(`${home.role} signs in and lands on their home (${size.name})`, async () => {
        const page = await newPage(browser, size.viewport);
        await signIn(page, home.email);
        await page.waitForURL((url) => url.pathname === home.path);
        await page.getByRole('heading', { name: home.heading, level: 1 }).first().waitFor();
        // The shell: bottom tabs on a phone, a side rail on a wide screen; both are navigation.
        await page.getByRole('navigation', { name: 'Main' }).waitFor();
        const fontFamily = await page
          .getByRole('heading', { level: 1 })
          .first()
          .evaluate((el) => getComputedStyle(el).fontFamily);
        assert.match(fontFamily, /Inter/);
        const fontsReady = await page.evaluate(async () => {
          await document.fonts.ready;
          return [...document.fonts].filter((f) => f.family.includes('Inter') && f.status === 'loaded').length;
        });
        assert.ok(fontsReady > 0, 'Inter is loaded from the bundle');
        await shot(page, `home-${home.role}-${size.name}`);
        await page.context().close();
      });
    }
  }

  it('shows a clear error for a wrong password', async () => {
    const page = await newPage(browser, PHONE);
    await page.goto(`${BASE_URL}/sign-in`);
    await page.getByLabel('E-mail').fill(ACCOUNTS.nurse);
    await page.getByLabel('Password', { exact: true }).fill('not-the-right-one');
    await page.getByRole('button', { name: 'Sign in' }).click();
    const alert = page.getByRole('alert').filter({ hasText: 'do not match' });
    await alert.waitFor();
    await shot(page, 'sign-in-wrong-password');
    await page.context().close();
  });

  it('keeps the session across a reload and returns to sign-in after sign-out', async () => {
    const page = await newPage(browser, PHONE);
    await signIn(page, ACCOUNTS.nurse);
    await page.reload();
    await page.getByRole('heading', { name: 'My infants', level: 1 }).first().waitFor();
    await page.goto(`${BASE_URL}/settings`);
    await page.getByRole('button', { name: 'Sign out' }).first().click();
    await page.waitForURL((url) => url.pathname === '/sign-in');
    await page.context().close();
  });

  it('resets a forgotten password from the sign-in screen, by the e-mailed link', async () => {
    const email = 'sunniva.hale@warmfold.test';
    const page = await newPage(browser, PHONE);
    await page.goto(`${BASE_URL}/sign-in`);
    await page.getByRole('button', { name: 'Forgot your password?' }).click();
    await page.getByRole('heading', { name: 'Forgot your password?', level: 1 }).waitFor();
    await page.getByLabel('E-mail').fill(email);
    await page.getByRole('button', { name: 'Send the reset link' }).click();
    await page.getByRole('status').filter({ hasText: 'If that address has an account' }).waitFor();
    await shot(page, 'forgot-password-sent');
    // The link reaches her own inbox (the local catcher) after the answer, from the mail queue.
    let link: string | undefined;
    for (let i = 0; i < 40 && !link; i++) {
      const db = new Database(path.join(process.env.E2E_DATA_DIR!, 'warmfold.db'), { readonly: true });
      const caught = db.prepare('SELECT text_body FROM caught_mail WHERE to_addresses = ? ORDER BY id DESC').get(email) as { text_body: string } | undefined;
      db.close();
      link = caught ? /(https?:\/\/\S+\/reset-password\?token=\S+)/.exec(caught.text_body)?.[1] : undefined;
      if (!link) await new Promise((r) => setTimeout(r, 250));
    }
    assert.ok(link, 'the reset link was mailed to her');
    const url = new URL(link);
    await page.goto(`${BASE_URL}${url.pathname}${url.search}`);
    await page.getByLabel('New password', { exact: true }).fill('lantern-meadow-copper-17');
    await page.getByRole('button', { name: 'Save the new password' }).click();
    await page.getByRole('status').filter({ hasText: 'Your password is set' }).waitFor();
    await signIn(page, email, 'lantern-meadow-copper-17');
    await page.waitForURL((u) => u.pathname === '/infants');
    await page.context().close();
  });

  it('shows its own not-found page', async () => {
    const page = await newPage(browser, PHONE);
    await page.goto(`${BASE_URL}/no/such/page`);
    await page.getByText('This page is not here').waitFor();
    await page.context().close();
  });
});
