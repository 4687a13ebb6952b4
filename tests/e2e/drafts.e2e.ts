import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, newPage, PHONE, shot, signIn } from './support';

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

interface StoredReading {
  id: string;
  probeCenti: number | null;
  remoteCenti: number | null;
  recordedAt: string;
  recordedBy: { id: string; name: string };
}

/** The infant's readings as the server holds them, asked under a session of the story's own. */
async function readingsOf(infantId: string): Promise<StoredReading[]> {
  const token = await apiToken(ACCOUNTS.nurse);
  const res = await fetch(`${BASE_URL}/api/infants/${infantId}/flowsheet?hours=72`, { headers: { Authorization: `Bearer ${token}` } });
  assert.equal(res.status, 200);
  return ((await res.json()) as { readings: StoredReading[] }).readings;
}

const matching = (rows: StoredReading[], probeCenti: number, remoteCenti: number, since: number) =>
  rows.filter((r) => r.probeCenti === probeCenti && r.remoteCenti === remoteCenti && Date.parse(r.recordedAt) >= since);

/** Open the infant from My infants and start a reading: probe, Tab, remote site. */
async function startReading(page: Page, bed: string, probe: string, remote: string): Promise<string> {
  await page.getByRole('link', { name: new RegExp(`^${bed}, `) }).click();
  await page.getByRole('button', { name: 'Record', exact: true }).click();
  const probeField = page.getByLabel(/^Probe temperature/);
  await probeField.waitFor();
  await probeField.fill(probe);
  await page.keyboard.press('Tab');
  await page.getByLabel(/^Remote-site temperature/).fill(remote);
  return new URL(page.url()).pathname.split('/')[2]!;
}

describe('never lose a reading, on a phone', () => {
  it('a session that ends mid-form: Save asks for sign-in over the form, then the reading is stored once', async () => {
    const page = await newPage(browser, PHONE);
    await signIn(page, ACCOUNTS.nurse);
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    const since = Date.now() - 1_000;
    const infantId = await startReading(page, 'N04', '36.7', '36.5');
    const before = matching(await readingsOf(infantId), 3670, 3650, since).length;
    assert.equal(before, 0);

    // The server ends this page's session (as signing out on another device does) while she types.
    const token = await page.evaluate(() => localStorage.getItem('warmfold.token'));
    assert.ok(token, 'the page holds a session');
    const ended = await fetch(`${BASE_URL}/api/auth/sign-out`, { method: 'POST', headers: { Authorization: `Bearer ${token}` } });
    assert.equal(ended.status, 204);

    await page.getByRole('button', { name: 'Save reading' }).click();
    const dialog = page.getByRole('dialog', { name: 'Your session ended' });
    await dialog.waitFor();
    // Focus is inside the dialog, in the password field (the e-mail is the ended session's).
    await page.waitForFunction(() => document.activeElement?.closest('[role="dialog"]') !== null && document.activeElement?.getAttribute('type') === 'password');
    assert.equal(await dialog.getByLabel('E-mail').inputValue(), ACCOUNTS.nurse);
    // The form is still there underneath, with what she typed.
    assert.equal(await page.getByLabel(/^Probe temperature/).inputValue(), '36.7');
    assert.equal(new URL(page.url()).pathname, `/infants/${infantId}/record`);
    await shot(page, 'drafts-1-session-ended-over-form');
    assert.equal(matching(await readingsOf(infantId), 3670, 3650, since).length, 0, 'nothing stored under the ended session');

    await page.keyboard.type('warm-hands-at-night');
    await page.keyboard.press('Enter');
    await dialog.waitFor({ state: 'detached' });
    await page.waitForURL((url) => url.pathname === `/infants/${infantId}`);
    await page.getByRole('heading', { level: 1 }).waitFor();
    await shot(page, 'drafts-2-saved-after-sign-in');

    const stored = matching(await readingsOf(infantId), 3670, 3650, since);
    assert.equal(stored.length, 1, 'the reading is stored exactly once');
    assert.equal(stored[0]!.recordedBy.name, 'Nia Okafor');
    // Nothing is left behind as a draft or a pending reading.
    const left = await page.evaluate(() => [localStorage.getItem('warmfold.reading-drafts.v1'), localStorage.getItem('warmfold.pending-readings.v1')]);
    assert.deepEqual(left, [null, null]);
    await page.context().close();
  });

  it('a reload mid-form: the typed values come back, and Save stores them once', async () => {
    const page = await newPage(browser, PHONE);
    await signIn(page, ACCOUNTS.nurse);
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    const since = Date.now() - 1_000;
    const infantId = await startReading(page, 'N03', '37.2', '36.9');
    // The draft is on the device before the page goes.
    await page.waitForFunction(() => (localStorage.getItem('warmfold.reading-drafts.v1') ?? '').includes('36.9'));

    await page.reload();
    const probe = page.getByLabel(/^Probe temperature/);
    await probe.waitFor();
    assert.equal(await probe.inputValue(), '37.2');
    assert.equal(await page.getByLabel(/^Remote-site temperature/).inputValue(), '36.9');
    await page.getByText(/^Draft kept from \d{1,2}:\d\d/).waitFor();
    await page.getByRole('button', { name: 'Discard draft' }).waitFor();
    await shot(page, 'drafts-3-restored-after-reload');

    await page.getByRole('button', { name: 'Save reading' }).click();
    await page.waitForURL((url) => url.pathname === `/infants/${infantId}`);
    await page.getByRole('heading', { level: 1 }).waitFor();
    const stored = matching(await readingsOf(infantId), 3720, 3690, since);
    assert.equal(stored.length, 1, 'the restored reading is stored exactly once');
    assert.equal(await page.evaluate(() => localStorage.getItem('warmfold.reading-drafts.v1')), null, 'the draft goes once saved');

    // Opening the form again starts empty: measurements come back only from her own unsaved draft.
    await page.getByRole('button', { name: 'Record', exact: true }).click();
    await page.getByLabel(/^Probe temperature/).waitFor();
    assert.equal(await page.getByLabel(/^Probe temperature/).inputValue(), '');
    assert.equal(await page.getByText(/Draft kept from/).count(), 0);
    await page.context().close();
  });
});
