import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import type { Browser } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, newPage, PHONE, shot, signIn, WIDE } from './support';

let browser: Browser;
let infantId: string | null = null;
before(async () => {
  browser = await launch();
});
after(async () => {
  // Leave the demo unit as the other stories expect it.
  if (infantId) await call('POST', `/infants/${infantId}/discharge`, await apiToken(ACCOUNTS.charge), { reason: 'home', note: 'End of the story.' }).catch(() => undefined);
  await browser.close();
});

async function call(method: 'GET' | 'POST', pathname: string, token: string, body?: object): Promise<any> {
  const res = await fetch(`${BASE_URL}/api${pathname}`, {
    method,
    headers: { Authorization: `Bearer ${token}`, ...(body ? { 'Content-Type': 'application/json' } : {}) },
    body: body ? JSON.stringify(body) : undefined,
  });
  assert.ok(res.status < 300, `${method} ${pathname} answered ${res.status}`);
  return res.json();
}

describe('severe hypothermia charted on a phone reaches the charge nurse', () => {
  it('tops the board (1440x900), reaches the charge nurse with Acknowledge, and the nurse’s card (390x844) says whom it reached (WHO 1997 via Miller 2011: below 32.0 °C is severe)', async () => {
    const charge = await apiToken(ACCOUNTS.charge);
    const admitted = await call('POST', '/units/unit-north/infants', charge, {
      bedId: 'bed-N12',
      displayName: 'Baby Frostmere',
      birthAt: new Date(Date.now() - 20 * 3600_000).toISOString(),
      gestationWeeks: 33,
      gestationDays: 1,
      birthWeightGrams: 1850,
      heatSource: 'radiant-warmer',
      controlMode: 'skin-servo',
      setTemperature: 36.5,
    });
    infantId = admitted.infant.id as string;
    await call('POST', '/units/unit-north/assignments', charge, { infantId, nurseId: 'u-nurse' });

    // The nurse charts axillary 31.8 °C on her phone and confirms the unusual value.
    const phone = await newPage(browser, PHONE);
    await signIn(phone, ACCOUNTS.nurse);
    await phone.waitForURL((url) => url.pathname === '/infants');
    await phone.getByRole('link', { name: /^N12, Baby Frostmere/ }).click();
    await phone.getByRole('heading', { name: /Baby Frostmere/, level: 1 }).waitFor();
    await phone.getByRole('button', { name: 'Record', exact: true }).click();
    await phone.getByLabel(/^Probe temperature/).fill('32.6');
    await phone.getByLabel(/^Remote-site temperature/).fill('31.8');
    await phone.getByRole('button', { name: 'Save reading' }).click();
    await phone.getByRole('button', { name: 'Confirm and save' }).click();
    const card = phone.getByRole('region', { name: /cold|hypothermia/i });
    await card.waitFor();
    assert.match(await card.innerText(), /severe hypothermia/i);
    await shot(phone, 'clinical-1-severe-on-phone');

    // The charge nurse's board: this bed first, critical, with the escalation and Acknowledge.
    const wide = await newPage(browser, WIDE);
    await signIn(wide, ACCOUNTS.charge);
    await wide.waitForURL((url) => url.pathname === '/board');
    await wide.getByRole('heading', { name: 'Unit board', level: 1 }).waitFor();
    const first = wide.locator('[data-testid^="bed-"]').first();
    await first.waitFor();
    assert.equal(await first.getAttribute('data-testid'), 'bed-N12');
    const tile = wide.getByTestId('bed-N12');
    await tile.getByText(/critical/i).first().waitFor();
    // Zero delay for the most severe: escalated at once, at most one scheduler minute later.
    await tile.getByText(/Told .*Marta Lindqvist/).waitFor({ timeout: 75_000 });
    await shot(wide, 'clinical-2-board-escalated');
    await tile.getByRole('button', { name: 'Acknowledge' }).click();
    await tile.getByText(/acknowledged by Marta Lindqvist/).waitFor();
    await shot(wide, 'clinical-3-board-acknowledged');

    // The nurse's card says whom it reached.
    await phone.reload();
    const reached = phone.getByRole('region', { name: /cold|hypothermia/i });
    await reached.getByText(/Told .*Marta Lindqvist/).first().waitFor();
    await shot(phone, 'clinical-4-card-says-whom');

    const board = await call('GET', '/units/unit-north/board', charge);
    const bed = board.beds.find((b: { label: string }) => b.label === 'N12');
    assert.equal(bed.infant.openFlags[0].severity, 'critical');
    assert.ok(bed.escalations[0].acknowledgedAt);
    await phone.context().close();
    await wide.context().close();
  });
});
