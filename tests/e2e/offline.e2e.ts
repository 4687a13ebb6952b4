import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, PHONE, shot, signIn } from './support';

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

/** Wait until the service worker controls the page (it registers after load, when the browser is idle). */
async function controlled(page: Page): Promise<void> {
  await page.waitForFunction(() => navigator.serviceWorker?.controller !== null && navigator.serviceWorker?.controller !== undefined, null, { timeout: 30_000 });
}

async function readingsOf(infantId: string): Promise<{ id: string }[]> {
  const token = await apiToken(ACCOUNTS.nurse);
  const res = await fetch(`${BASE_URL}/api/infants/${infantId}/flowsheet?hours=72`, { headers: { Authorization: `Bearer ${token}` } });
  assert.equal(res.status, 200);
  return ((await res.json()) as { readings: { id: string }[] }).readings;
}

describe('an installed app with no connection', () => {
  it('opens My infants, the flowsheet and the record form offline, and sends a reading kept on the phone when the connection returns', async () => {
    const context: BrowserContext = await browser.newContext({ viewport: PHONE });
    let page = await context.newPage();
    page.setDefaultTimeout(15_000);

    // Online once: sign in, open My infants and a flowsheet (as a nurse does at the start of a shift).
    await signIn(page, ACCOUNTS.nurse);
    await page.goto(`${BASE_URL}/infants`);
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    const manifest = await page.locator('link[rel="manifest"]').getAttribute('href');
    assert.equal(manifest, '/manifest.webmanifest');
    const installable = (await (await fetch(`${BASE_URL}/manifest.webmanifest`)).json()) as { display: string; icons: { sizes: string }[] };
    // Installability (web app manifest, W3C): a standalone display and a 192 and 512 px icon.
    assert.equal(installable.display, 'standalone');
    assert.ok(installable.icons.some((i) => i.sizes === '192x192') && installable.icons.some((i) => i.sizes === '512x512'));
    await controlled(page);
    await page.reload();
    await page.getByRole('link', { name: /^N01, / }).click();
    await page.getByRole('heading', { level: 1 }).waitFor();
    const infantId = new URL(page.url()).pathname.split('/')[2]!;
    await page.getByRole('button', { name: 'Record', exact: true }).waitFor();
    const before = (await readingsOf(infantId)).length;
    // The flowsheet reads the record form's defaults ahead, so the form opens offline too.
    await page.waitForFunction(async (id) => (await (await caches.open('warmfold-api')).keys()).some((r) => new URL(r.url).pathname === `/api/infants/${id}`), infantId, {
      timeout: 15_000,
    });
    // The stored answers never include the session check (/api/auth is never kept).
    const kept = await page.evaluate(async () => (await (await caches.open('warmfold-api')).keys()).map((r) => new URL(r.url).pathname));
    assert.ok(
      kept.some((p) => p.startsWith('/api/infants')),
      `API answers kept: ${kept.join(', ')}`,
    );
    assert.ok(!kept.some((p) => p.startsWith('/api/auth')), `no /api/auth answer kept: ${kept.join(', ')}`);
    await page.close();

    // The phone loses its signal; the app is started again from its icon.
    await context.setOffline(true);
    page = await context.newPage();
    page.setDefaultTimeout(15_000);
    await page.goto(`${BASE_URL}/infants`);
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    await page.getByRole('link', { name: /^N01, / }).waitFor();
    await shot(page, 'offline-1-my-infants');
    await page.getByRole('link', { name: /^N01, / }).click();
    await page.getByRole('button', { name: 'Record', exact: true }).click();
    const probe = page.getByLabel(/^Probe temperature/);
    await probe.waitFor();
    await shot(page, 'offline-2-record-form');
    await probe.fill('36.8');
    await page.keyboard.press('Tab');
    await page.getByLabel(/^Remote-site temperature/).fill('36.6');
    await page.getByRole('button', { name: 'Save reading' }).click();
    await page.getByText('Not yet saved').first().waitFor();
    await shot(page, 'offline-3-kept-on-phone');
    assert.equal((await readingsOf(infantId)).length, before, 'nothing reached the server while offline');

    // The signal returns: the kept reading goes out by itself.
    await context.setOffline(false);
    await page.getByText('Not yet saved').first().waitFor({ state: 'detached', timeout: 45_000 });
    assert.equal((await readingsOf(infantId)).length, before + 1, 'the reading kept on the phone was sent once');
    await shot(page, 'offline-4-sent');

    // Signing out forgets every stored API answer on the phone.
    await page.goto(`${BASE_URL}/settings`);
    await page.getByRole('button', { name: 'Sign out' }).first().click();
    await page.waitForURL((url) => url.pathname.startsWith('/sign-in'));
    await page.waitForFunction(async () => (await (await caches.open('warmfold-api')).keys()).length === 0, null, { timeout: 10_000 });
    await context.close();
  });
});
