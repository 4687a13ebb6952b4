/**
 * The probe's place, charted, on a phone (390x844). A probe on the abdomen of an infant lying
 * prone lies between the infant and the mattress and reads the mattress, not the infant: the
 * form prompts to move it to the back or flank before saving, the flowsheet shows the stored
 * prompt after saving, and charting the probe moved to the back clears it (Iowa Neonatology
 * Handbook, "Servocontrol": flank if prone; common practice).
 */
import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import type { Browser } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, newPage, PHONE, shot, signIn } from './support';

let browser: Browser;
let infantId: string | null = null;
const NAME = 'Baby Marrowdene';

async function call(method: string, path: string, token: string, body?: unknown) {
  const res = await fetch(`${BASE_URL}/api${path}`, {
    method,
    headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: res.status, body: (await res.json().catch(() => null)) as Record<string, unknown> | null };
}

before(async () => {
  browser = await launch();
});
after(async () => {
  // The story's infant leaves again, so the board holds only the demo afterwards.
  if (infantId) await call('POST', `/infants/${infantId}/discharge`, await apiToken(ACCOUNTS.charge), { reason: 'home' }).catch(() => undefined);
  await browser.close();
});

describe('probe placement on a phone', () => {
  it('a prone infant with an abdominal probe gets the prompt on the form and on the flowsheet; moving the probe to the back clears it', async () => {
    // The charge nurse admits an infant lying on its back with the probe on the abdomen, covered.
    const charge = await apiToken(ACCOUNTS.charge);
    const board = await call('GET', '/units/unit-north/board', charge);
    const beds = (board.body?.beds ?? []) as { bedId: string; label: string; infant: unknown }[];
    const bed = beds.find((b) => b.infant === null);
    assert.ok(bed, 'an empty bed in the North unit');
    const admitted = await call('POST', '/units/unit-north/infants', charge, {
      bedId: bed.bedId,
      displayName: NAME,
      birthAt: new Date(Date.now() - 2 * 86_400_000).toISOString(),
      gestationWeeks: 33,
      gestationDays: 2,
      birthWeightGrams: 1890,
      heatSource: 'incubator',
      controlMode: 'skin-servo',
      setTemperature: 36.5,
      hospitalNumber: 'MRW-3312',
      sex: 'male',
      probeSite: 'abdomen',
      probeCovered: true,
      position: 'supine',
    });
    assert.equal(admitted.status, 201);
    infantId = (admitted.body!.infant as { id: string }).id;

    const page = await newPage(browser, PHONE);
    await signIn(page, ACCOUNTS.nurse);
    await page.waitForURL((url) => url.pathname === '/infants');
    await page.getByRole('radio', { name: 'Whole unit' }).click();
    await page.getByRole('link', { name: new RegExp(`^${bed.label}, ${NAME}`) }).click();
    await page.getByRole('heading', { name: new RegExp(NAME), level: 1 }).waitFor();
    const placement = page.getByRole('region', { name: 'Probe placement' });
    await placement.getByText(/Probe on the abdomen, under a heat-reflecting cover/).waitFor();
    assert.equal(await placement.getByText(/reads the mattress/).count(), 0);

    // The nurse turns the infant prone and charts it with the next check: the form prompts first.
    await page.getByRole('button', { name: 'Record', exact: true }).click();
    await page.getByLabel(/^Probe temperature/).waitFor();
    const site = page.getByRole('radiogroup', { name: 'Probe site' });
    assert.equal(await site.getByRole('radio', { name: 'Abdomen' }).getAttribute('aria-checked'), 'true', 'the probe site carried forward');
    await page.getByLabel(/^Probe temperature/).fill('36.3');
    await page.getByRole('radiogroup', { name: "Infant's position" }).getByRole('radio', { name: 'On the front (prone)' }).click();
    const prompt = page.getByRole('alert', { name: 'Probe placement prompt' });
    await prompt.getByText(/reads the mattress, not the infant/).waitFor();
    await prompt.scrollIntoViewIfNeeded();
    await shot(page, 'placement-1-form-prompt');
    await page.getByRole('button', { name: 'Save reading' }).click();

    // Saved: the flowsheet shows the stored prompt at the top, and the reading's placement.
    await page.getByRole('heading', { name: new RegExp(NAME), level: 1 }).waitFor();
    await placement.getByText(/reads the mattress, not the infant/).waitFor();
    await placement.getByText(/On the front \(prone\)/).waitFor();
    await page
      .getByText(/probe Abdomen, covered · prone/)
      .first()
      .waitFor();
    await placement.scrollIntoViewIfNeeded();
    await shot(page, 'placement-2-flowsheet-prompt');

    // She moves the probe to the back and charts it: the prompt clears.
    await placement.getByRole('button', { name: 'Moved the probe to the back or flank' }).click();
    await placement.getByText(/Probe on the back or flank, under a heat-reflecting cover/).waitFor();
    await placement.getByText(/reads the mattress/).waitFor({ state: 'detached' });
    await shot(page, 'placement-3-moved');

    // The board tile reads the same stored placement.
    const after = await call('GET', '/units/unit-north/board', charge);
    const tile = ((after.body?.beds ?? []) as { bedId: string; infant: { placement?: { probeSite: string; prompt: unknown } } | null }[]).find((b) => b.bedId === bed.bedId);
    assert.equal(tile?.infant?.placement?.probeSite, 'back-or-flank');
    assert.equal(tile?.infant?.placement?.prompt, null);
  });
});
