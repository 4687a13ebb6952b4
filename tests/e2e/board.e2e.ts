import assert from 'node:assert/strict';
import fs from 'node:fs';
import path from 'node:path';
import { after, before, describe, it } from 'node:test';
import type { Browser } from 'playwright-core';
import { ACCOUNTS, apiToken, ARTIFACTS, BASE_URL, launch, newPage, shot, signIn, WIDE } from './support';

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

async function api<T>(pathname: string, token: string): Promise<T> {
  const res = await fetch(`${BASE_URL}/api${pathname}`, { headers: { Authorization: `Bearer ${token}` } });
  assert.equal(res.status, 200, `${pathname} answered ${res.status}`);
  return (await res.json()) as T;
}

describe('the charge nurse at the unit board (1440x900)', () => {
  it('sees the overdue infant first, reassigns it, acknowledges the escalation; the mail is caught; the handover prints', async () => {
    const page = await newPage(browser, WIDE);
    await signIn(page, ACCOUNTS.charge);
    await page.waitForURL((url) => url.pathname === '/board');
    await page.getByRole('heading', { name: 'Unit board', level: 1 }).waitFor();

    // The most urgent bed is first: Baby Brightwater in N02, whose remote-site check is overdue.
    const first = page.locator('[data-testid^="bed-"]').first();
    await first.waitFor();
    assert.equal(await first.getAttribute('data-testid'), 'bed-N02');
    const tile = page.getByTestId('bed-N02');
    await tile.getByText('Baby Brightwater').waitFor();
    // The countdown says how late in words, never a clock-like time.
    const overdue = await tile.getByText(/^Overdue by\s\d+\s(min|h)/).textContent();
    assert.doesNotMatch(overdue ?? '', /\d:\d\d/);
    await shot(page, 'board-charge-wide');

    // Reassign Baby Brightwater to Kofi Mensah for this shift.
    await tile.getByRole('button', { name: 'Manage bed N02' }).click();
    const panel = page.locator('[aria-label="Bed N02 actions"]');
    await panel.getByRole('radiogroup', { name: 'Assigned nurse' }).getByRole('radio', { name: 'Kofi Mensah' }).click();
    await panel.getByRole('button', { name: 'Assign' }).click();
    await panel.waitFor({ state: 'detached' });
    await tile.getByText('Kofi Mensah').waitFor();

    // The server escalated the demo's overdue check at start-up; acknowledge it.
    await tile.getByText(/^Told Marta Lindqvist at/).waitFor();
    await tile.getByRole('button', { name: 'Acknowledge' }).click();
    await tile.getByText(/acknowledged by Marta Lindqvist/i).waitFor();
    await shot(page, 'board-acknowledged');

    const charge = await apiToken(ACCOUNTS.charge);
    const board = await api<{ beds: { label: string; infant: { assignedNurse: { name: string } | null } | null; escalations: { acknowledgedAt: string | null }[] }[] }>(
      '/units/unit-north/board',
      charge,
    );
    const n02 = board.beds.find((b) => b.label === 'N02')!;
    assert.equal(n02.infant?.assignedNurse?.name, 'Kofi Mensah');
    assert.ok(n02.escalations[0]?.acknowledgedAt);

    // The escalation e-mail went through SMTP to the local catcher, into the charge nurse's own mailbox.
    const { messages } = await api<{ messages: { subject: string; to: string; text: string }[] }>('/mailbox', charge);
    const mail = messages.find((m) => m.subject.includes('bed N02'));
    assert.ok(mail, 'the N02 escalation mail was caught');
    assert.equal(mail.to, ACCOUNTS.charge);
    assert.match(mail.text, /Baby Brightwater/);
    assert.equal(messages.filter((m) => m.subject.includes('bed N02')).length, 1);

    // The handover prints to PDF with the infant's readings.
    const { infants } = await api<{ infants: { infant: { id: string }; readings: unknown[] }[] }>('/infants/inf-brightwater/handover', charge);
    assert.ok(infants[0]!.readings.length > 0);
    await page.goto(`${BASE_URL}/handover/inf-brightwater`);
    await page.getByRole('heading', { name: 'Handover: Baby Brightwater', level: 1 }).waitFor();
    await page.getByRole('table', { name: 'Readings, newest first' }).waitFor();
    await page.emulateMedia({ media: 'print' });
    assert.equal(await page.getByRole('row').count(), infants[0]!.readings.length + 1);
    assert.equal(await page.getByRole('navigation', { name: 'Main' }).isVisible(), false, 'the navigation is hidden in print');
    assert.equal(await page.getByRole('button', { name: 'Print' }).isVisible(), false, 'the buttons are hidden in print');
    const pdf = await page.pdf({ format: 'A4', printBackground: false });
    fs.mkdirSync(ARTIFACTS, { recursive: true });
    fs.writeFileSync(path.join(ARTIFACTS, 'handover-brightwater.pdf'), pdf);
    assert.equal(pdf.subarray(0, 5).toString(), '%PDF-');
    assert.ok(pdf.length > 10_000, 'the PDF has content');
    await page.context().close();
  });

  it('hands the whole unit over: the charge nurse’s handover opens on the whole unit, every admitted infant by bed', async () => {
    const page = await newPage(browser, WIDE);
    await signIn(page, ACCOUNTS.charge);
    await page.waitForURL((url) => url.pathname === '/board');
    const charge = await apiToken(ACCOUNTS.charge);
    const { infants } = await api<{ infants: { infant: { displayName: string; bedLabel: string } }[] }>('/units/unit-north/handover', charge);
    assert.ok(infants.length > 2, 'the demo unit has several infants admitted');
    await page.goto(`${BASE_URL}/handover`);
    // She hands the unit over, not her own (usually empty) list: the unit comes first.
    await page.getByRole('heading', { name: 'Unit handover', level: 1 }).waitFor();
    assert.equal(await page.getByRole('radio', { name: 'Whole unit' }).getAttribute('aria-checked'), 'true');
    for (const h of infants) await page.getByText(h.infant.displayName, { exact: false }).first().waitFor();
    await page.emulateMedia({ media: 'print' });
    assert.equal(await page.getByRole('radio', { name: 'Whole unit' }).isVisible(), false, 'the choice is hidden in print');
    await shot(page, 'handover-unit-wide');
    await page.context().close();
  });
});
