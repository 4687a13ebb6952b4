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

async function setTempUnit(email: string, tempUnit: 'C' | 'F') {
  const token = await apiToken(email);
  const res = await fetch(`${BASE_URL}/api/auth/me/preferences`, {
    method: 'PATCH',
    headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
    body: JSON.stringify({ tempUnit }),
  });
  assert.equal(res.status, 200);
}

/** Record probe and remote site the routine way: Record, digits, Tab, digits, Enter. */
async function record(page: Page, probe: string, remote: string) {
  await page.getByRole('button', { name: 'Record', exact: true }).click();
  const probeField = page.getByLabel(/^Probe temperature/);
  await probeField.waitFor();
  await probeField.fill(probe);
  await page.keyboard.press('Tab');
  await page.getByLabel(/^Remote-site temperature/).fill(remote);
}

async function gapStory(page: Page, unit: 'C' | 'F', infant: string, bed: string) {
  const tag = unit === 'C' ? 'celsius' : 'fahrenheit';
  await page.getByRole('radio', { name: 'Whole unit' }).click();
  await page.getByRole('link', { name: new RegExp(`^${bed}, ${infant}`) }).click();
  await page.getByRole('heading', { name: new RegExp(infant), level: 1 }).waitFor();
  await shot(page, `bedside-${tag}-1-flowsheet`);

  const [probe, remote, recheckProbe, recheckRemote] = unit === 'C' ? ['36.9', '36.2', '36.6', '36.3'] : ['98.4', '97.1', '97.9', '97.4'];
  await record(page, probe, remote);
  await page.getByText(/A gap flag will be raised/).waitFor();
  await shot(page, `bedside-${tag}-2-gap-preview`);
  await page.keyboard.press('Enter');

  const flag = page.getByRole('region', { name: 'Gap flag' });
  await flag.waitFor();
  assert.match(await flag.innerText(), unit === 'C' ? /0\.7 °C apart/ : /1\.3 °F apart/);
  await shot(page, `bedside-${tag}-3-gap-flag`);

  await flag.getByRole('button', { name: 'Checked probe contact' }).click();
  await flag.getByText(/✓ Checked probe contact/).waitFor();
  await flag.getByRole('button', { name: 'Moved the probe to another site' }).click();
  await flag.getByText(/✓ Moved the probe to another site/).waitFor();
  await flag.getByText(/Recheck due in/).waitFor();
  await shot(page, `bedside-${tag}-4-actions`);

  await record(page, recheckProbe, recheckRemote);
  await page.getByText(/within the .* limit/).waitFor();
  await shot(page, `bedside-${tag}-5-recheck`);
  await page.keyboard.press('Enter');
  await page.getByRole('region', { name: 'Gap flag' }).waitFor({ state: 'detached' });
  await page.getByText(/Closed flags/).waitFor();
  await shot(page, `bedside-${tag}-6-flag-closed`);
}

describe('bedside charting on a phone', () => {
  it('a nurse records a 0.7 °C gap, acts on it, rechecks and sees the flag close', async () => {
    const page = await newPage(browser, PHONE);
    await signIn(page, ACCOUNTS.nurse);
    await page.waitForURL((url) => url.pathname === '/infants');
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    await shot(page, 'bedside-my-infants');
    await gapStory(page, 'C', 'Baby Glimmerton A', 'N07');
  });

  it('the same story in °F for a nurse whose setting is °F', async () => {
    await setTempUnit(ACCOUNTS.nurse, 'F');
    const page = await newPage(browser, PHONE);
    await signIn(page, ACCOUNTS.nurse);
    await page.goto(`${BASE_URL}/infants`);
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    await gapStory(page, 'F', 'Baby Glimmerton B', 'N08');
  });
});
