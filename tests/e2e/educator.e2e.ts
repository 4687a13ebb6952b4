import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import type { Browser } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, newPage, PHONE, shot, signIn, WIDE } from './support';

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

async function api<T>(token: string, path: string, body?: object): Promise<T> {
  const res = await fetch(`${BASE_URL}/api${path}`, {
    method: body ? 'POST' : 'GET',
    headers: { Authorization: `Bearer ${token}`, ...(body ? { 'Content-Type': 'application/json' } : {}) },
    body: body ? JSON.stringify(body) : undefined,
  });
  assert.ok(res.ok, `${path}: ${res.status}`);
  return (await res.json()) as T;
}

describe('the educator’s loop', () => {
  it('the nurse marks a teaching note read on her phone; the educator sees that she did, and when', async () => {
    const educator = await apiToken(ACCOUNTS.educator);
    const queue = await api<{ items: { flagId: string; kind: string; nurse: { id: string; name: string } | null; withdrawn?: boolean }[] }>(
      educator,
      '/review/queue?kind=gap&status=all&limit=200',
    );
    const item = queue.items.find((i) => i.nurse?.name === 'Nia Okafor' && !i.withdrawn);
    assert.ok(item, 'a gap flag of the demo nurse');
    const note = `Good catch; move the probe to the flank when she is prone (${Date.now()}).`;
    await api(educator, `/review/items/${item.flagId}/notes`, { note });

    const phone = await newPage(browser, PHONE);
    await signIn(phone, ACCOUNTS.nurse);
    await phone.waitForURL((url) => url.pathname === '/infants');
    await phone.getByRole('heading', { name: 'Notes from your educator' }).waitFor({ timeout: 30_000 });
    await phone.getByText(note).waitFor();
    await phone.getByRole('button', { name: 'Mark as read' }).first().click();
    await phone
      .getByText(/^You marked this read, /)
      .first()
      .waitFor();
    await shot(phone, 'nurse-note-marked-read-phone');
    await phone.context().close();

    const page = await newPage(browser, PHONE);
    await signIn(page, ACCOUNTS.educator);
    await page.waitForURL((url) => url.pathname === '/review');
    await page.goto(`${BASE_URL}/review/${item.flagId}`);
    await page.getByRole('heading', { name: 'Teaching notes' }).waitFor();
    await page.getByText(note).waitFor();
    await page.getByText(/^Read by Nia Okafor, \d{1,2} \w{3}, /).waitFor();
    await page.getByText('Review: Noted and read by the nurse').waitFor();
    // On a 390 px phone the readings table's last column is reached by scrolling the table sideways.
    const last = page.getByRole('columnheader', { name: 'By' });
    await last.scrollIntoViewIfNeeded();
    const box = await last.boundingBox();
    assert.ok(box && box.x >= 0 && box.x + box.width <= PHONE.width, `the last column is on screen after scrolling: ${JSON.stringify(box)}`);
    await shot(page, 'educator-sees-note-read-phone');

    // A reversed range is said under the dates; the other filters stay and the screen still works.
    await page.goto(`${BASE_URL}/review`);
    await page.getByRole('heading', { name: 'Review queue', level: 1 }).waitFor();
    await page.getByRole('radio', { name: 'Night' }).click();
    await page.getByLabel('From date').fill('2026-11-10');
    await page.getByLabel('To date').fill('2026-11-01');
    await page.getByRole('alert').filter({ hasText: 'The end date must not be before the start date.' }).waitFor();
    assert.equal(await page.getByRole('radio', { name: 'Night' }).getAttribute('aria-checked'), 'true');
    await page.getByRole('link', { name: /, / }).first().waitFor();
    await shot(page, 'review-queue-reversed-range-phone');

    // Reports on the phone: trends, the comparison, by nurse and the admission measure, the median said as such.
    await page.goto(`${BASE_URL}/reports`);
    await page.getByRole('heading', { name: 'Reports', level: 1 }).waitFor();
    await page
      .getByText(/mean of the two middle values/)
      .first()
      .waitFor({ timeout: 30_000 });
    for (const name of ['Trends', 'This range against the one before', 'By nurse', 'Temperature on admission, born before 32 weeks'])
      await page.getByRole('heading', { name }).waitFor({ timeout: 30_000 });
    await page.getByRole('table', { name: 'Flags and reviews by nurse' }).getByRole('cell', { name: 'Nia Okafor' }).waitFor();
    await shot(page, 'reports-more-phone');
    await page.context().close();
  });

  it('the charge nurse opens the admission-temperature measure from Audit on her phone', async () => {
    const page = await newPage(browser, PHONE);
    await signIn(page, ACCOUNTS.charge);
    await page.waitForURL((url) => url.pathname === '/board');
    await page.getByRole('link', { name: 'Audit' }).first().click();
    await page.getByRole('heading', { name: 'Admission temperature', level: 1 }).waitFor();
    await page.getByRole('heading', { name: 'Temperature on admission, born before 32 weeks' }).waitFor();
    await page
      .getByText(/ of \d+\)$/)
      .first()
      .waitFor({ timeout: 30_000 });
    await shot(page, 'charge-admission-measure-phone');
    await page.context().close();
  });
});
