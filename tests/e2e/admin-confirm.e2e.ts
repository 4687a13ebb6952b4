import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, newPage, shot, signIn, WIDE } from './support';

/**
 * Changes that take access away are confirmed in a modal dialog that names the person and the
 * change; focus moves into the dialog and comes back to the button that opened it (WAI-ARIA
 * Authoring Practices 1.2, Dialog (Modal) pattern; WCAG 2.2 SC 2.4.3 Focus Order).
 */

let browser: Browser;
before(async () => {
  browser = await launch();
  const warm = await newPage(browser, WIDE);
  await warm.goto(`${BASE_URL}/sign-in`, { timeout: 90_000 });
  await warm.getByLabel('E-mail').waitFor({ timeout: 90_000 });
  await warm.context().close();
});
after(async () => {
  await browser.close();
});

const focused = (page: Page) =>
  page.evaluate(() => ({ label: document.activeElement?.getAttribute('aria-label') ?? '', inDialog: !!document.activeElement?.closest('[role="dialog"]') }));

async function kofiActive(): Promise<boolean> {
  const token = await apiToken(ACCOUNTS.admin);
  const res = await fetch(`${BASE_URL}/api/admin/users`, { headers: { Authorization: `Bearer ${token}` } });
  const { users } = (await res.json()) as { users: { email: string; active: boolean; role: string }[] };
  return users.find((u) => u.email === 'kofi.mensah@warmfold.test')!.active;
}

describe('admin confirmations', () => {
  it('deactivation asks first, naming the person; Escape cancels and gives focus back; confirming deactivates', async () => {
    const page = await newPage(browser, WIDE);
    await signIn(page, ACCOUNTS.admin);
    await page.waitForURL((url) => url.pathname === '/admin');
    const row = page.locator('[aria-label="Kofi Mensah, Bedside nurse"]');
    const opener = row.getByRole('button', { name: 'Deactivate…' });
    await opener.focus();
    await page.keyboard.press('Enter');
    const dialog = page.getByRole('dialog', { name: 'Deactivate Kofi Mensah?' });
    await dialog.waitFor();
    await dialog.getByText(/kofi\.mensah@warmfold\.test\) is signed out at once/).waitFor();
    assert.deepEqual(await focused(page), { label: 'Cancel', inDialog: true }, 'focus moves into the dialog');
    await shot(page, 'admin-confirm-deactivate');

    await page.keyboard.press('Escape');
    await dialog.waitFor({ state: 'detached' });
    await page.waitForFunction(() => document.activeElement?.getAttribute('aria-label') === 'Deactivate…');
    assert.equal(await kofiActive(), true, 'cancelling changes nothing');

    await opener.click();
    await dialog.getByRole('button', { name: 'Deactivate Kofi Mensah' }).click();
    await dialog.waitFor({ state: 'detached' });
    await row.getByText('Deactivated').waitFor();
    assert.equal(await kofiActive(), false);
    await row.getByRole('button', { name: 'Reactivate' }).click();
    await row.getByText('Active', { exact: true }).waitFor();
    await page.context().close();
  });

  it('a role change is reviewed in a dialog naming the old and new role before it is made', async () => {
    const page = await newPage(browser, WIDE);
    await signIn(page, ACCOUNTS.admin);
    await page.waitForURL((url) => url.pathname === '/admin');
    const row = page.locator('[aria-label="Kofi Mensah, Bedside nurse"]');
    await row.getByRole('button', { name: 'Change role' }).click();
    await row.getByRole('radio', { name: 'Charge nurse' }).click();
    await row.getByRole('button', { name: 'Review the change…' }).click();
    const dialog = page.getByRole('dialog', { name: "Change Kofi Mensah's access?" });
    await dialog.getByText('Role: Bedside nurse → Charge nurse.').waitFor();
    await dialog.getByRole('button', { name: 'Cancel' }).click();
    await dialog.waitFor({ state: 'detached' });
    await row
      .getByText(/Bedside nurse/)
      .first()
      .waitFor();
    await page.context().close();
  });
});
