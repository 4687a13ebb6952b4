import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import type { Browser } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, newPage, PHONE, shot, signIn, WIDE } from './support';

/**
 * The administrator's console on a phone and a desk screen: a unit membership added and removed one
 * at a time, each after a dialog naming the person and the unit (WAI-ARIA Authoring Practices 1.2,
 * Dialog (Modal) pattern), and the audit log showing who made the change with before and after.
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

async function kofiUnits(): Promise<string[]> {
  const token = await apiToken(ACCOUNTS.admin);
  const res = await fetch(`${BASE_URL}/api/admin/users?q=kofi`, { headers: { Authorization: `Bearer ${token}` } });
  const { users } = (await res.json()) as { users: { unitIds: string[] }[] };
  return users[0]!.unitIds;
}

describe('admin console', () => {
  for (const [size, viewport] of [
    ['wide', WIDE],
    ['phone', PHONE],
  ] as const) {
    it(`adds Kofi to South and removes him from North, one unit at a time, and the audit log shows it (${size})`, async () => {
      const page = await newPage(browser, viewport);
      await signIn(page, ACCOUNTS.admin);
      await page.waitForURL((url) => url.pathname === '/admin');
      await page.getByLabel('Search people').fill('kofi');
      const row = page.locator('[aria-label="Kofi Mensah, Bedside nurse"]');
      await row.waitFor();
      assert.deepEqual(await kofiUnits(), ['unit-north']);

      await row.getByRole('button', { name: 'Add to Special Care South…' }).click();
      let dialog = page.getByRole('dialog', { name: 'Add Kofi Mensah to Special Care South?' });
      await dialog.getByText('Kofi Mensah keeps Neonatal Unit North.').waitFor();
      await shot(page, `admin-console-add-${size}`);
      await dialog.getByRole('button', { name: 'Add to Special Care South' }).click();
      await dialog.waitFor({ state: 'detached' });
      await row.getByRole('button', { name: 'Remove from Neonatal Unit North…' }).waitFor();
      assert.deepEqual(await kofiUnits(), ['unit-north', 'unit-south']);

      await row.getByRole('button', { name: 'Remove from Neonatal Unit North…' }).click();
      dialog = page.getByRole('dialog', { name: 'Remove Kofi Mensah from Neonatal Unit North?' });
      await dialog.getByText('Kofi Mensah keeps Special Care South.').waitFor();
      await dialog.getByRole('button', { name: 'Remove from Neonatal Unit North' }).click();
      await dialog.waitFor({ state: 'detached' });
      assert.deepEqual(await kofiUnits(), ['unit-south']);
      // The last unit has no remove button: he keeps one.
      assert.equal(await row.getByRole('button', { name: /Remove from/ }).count(), 0);

      // The audit log, filtered to the administrator, names the removal with its before and after.
      await page.getByLabel('Changed by').fill('Tomás');
      await page.getByRole('button', { name: 'Show events' }).click();
      const removed = page.getByRole('listitem', { name: /^membership-removed by Tomás Vidal/ }).first();
      await removed.scrollIntoViewIfNeeded();
      await removed.getByText('unitIds: unit-north, unit-south → unit-south').waitFor();
      await shot(page, `admin-console-audit-${size}`);

      // Put him back in North through the screen for the next size.
      await page.getByLabel('Search people').scrollIntoViewIfNeeded();
      await row.getByRole('button', { name: 'Add to Neonatal Unit North…' }).click();
      dialog = page.getByRole('dialog', { name: 'Add Kofi Mensah to Neonatal Unit North?' });
      await dialog.getByRole('button', { name: 'Add to Neonatal Unit North' }).click();
      await dialog.waitFor({ state: 'detached' });
      await row.getByRole('button', { name: 'Remove from Special Care South…' }).click();
      dialog = page.getByRole('dialog', { name: 'Remove Kofi Mensah from Special Care South?' });
      await dialog.getByRole('button', { name: 'Remove from Special Care South' }).click();
      await dialog.waitFor({ state: 'detached' });
      assert.deepEqual(await kofiUnits(), ['unit-north']);
      await page.context().close();
    });
  }

  it('the settings form names every field at fault, each under its field (wide)', async () => {
    const page = await newPage(browser, WIDE);
    await signIn(page, ACCOUNTS.admin);
    await page.waitForURL((url) => url.pathname === '/admin');
    // The first settings card is North's (units are listed by name). Its check interval is 120 min.
    await page.getByLabel('Due-soon window').first().fill('120');
    await page.getByLabel('Time zone', { exact: true }).first().fill('utc');
    await page.getByLabel('Night shift starts').first().fill('06:00');
    await page.getByRole('button', { name: 'Save Neonatal Unit North settings' }).click();
    await page.getByText(/^3 settings need attention: (?=.*Due-soon window)(?=.*Night shift starts)(?=.*Time zone)/).waitFor();
    await page.getByText(/"utc" is not a canonical time zone/).waitFor();
    await page.getByText(/must start later in the day than the day shift/).waitFor();
    await page.getByText(/must be shorter than the check interval/).waitFor();
    await page.getByText(/"utc" is not a canonical time zone/).scrollIntoViewIfNeeded();
    await shot(page, 'admin-console-settings-errors-wide');
    await page.context().close();
  });
});
