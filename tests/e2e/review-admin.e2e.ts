import Database from 'better-sqlite3';
import assert from 'node:assert/strict';
import fs from 'node:fs';
import path from 'node:path';
import { after, before, describe, it } from 'node:test';
import type { Browser } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, newPage, shot, signIn, WIDE } from './support';

let browser: Browser;
before(async () => {
  browser = await launch();
  // The first load of the bundle on a busy two-core machine can outlast a page's 15 s default.
  const warm = await newPage(browser, WIDE);
  await warm.goto(`${BASE_URL}/sign-in`, { timeout: 90_000 });
  await warm.getByLabel('E-mail').waitFor({ timeout: 90_000 });
  await warm.context().close();
});
after(async () => {
  await browser.close();
});

describe('review queue and administration', () => {
  it('the educator filters to night shifts, opens a gap flag, writes a teaching note and exports CSV', async () => {
    const page = await newPage(browser, WIDE);
    await signIn(page, ACCOUNTS.educator);
    await page.waitForURL((url) => url.pathname === '/review');
    await page.getByRole('heading', { name: 'Review queue', level: 1 }).waitFor();
    await page.getByRole('radio', { name: 'Night' }).click();
    await page.getByRole('radio', { name: 'Gap flag' }).click();
    const first = page.getByRole('link', { name: /^Gap flag, / }).first();
    await first.waitFor();
    const rows = page.getByRole('link', { name: /^Gap flag, / });
    assert.ok((await rows.count()) > 0);
    await page.getByText('Night shift').first().waitFor();
    assert.equal(await page.getByText('Day shift').count(), 0, 'only night shifts are listed');
    await shot(page, 'review-queue-night-gaps');

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Flags CSV (with teaching notes)' }).click()]);
    const file = await download.path();
    const bytes = fs.readFileSync(file!);
    // A spreadsheet reads the file as UTF-8 by its byte-order mark, EF BB BF (Unicode §23.8).
    assert.deepEqual([...bytes.subarray(0, 3)], [0xef, 0xbb, 0xbf]);
    const csv = bytes.subarray(3).toString('utf8');
    assert.match(csv.split('\r\n')[0]!, /^flag_id,kind,unit,infant/);
    for (const line of csv.trim().split('\r\n').slice(1)) assert.match(line, /,gap,.*,night,/);

    await first.click();
    await page.waitForURL((url) => url.pathname.startsWith('/review/'));
    await page.getByRole('heading', { name: 'Readings around the event' }).waitFor();
    await page.getByRole('heading', { name: 'Actions taken' }).waitFor();
    const note = `Well caught on a night shift; recheck sooner next time (${Date.now()}).`;
    await page.getByLabel('Teaching note').fill(note);
    await page.getByRole('button', { name: 'Mark reviewed with this note' }).click();
    await page.getByRole('status').filter({ hasText: 'marked reviewed' }).waitFor();
    await page.getByText(note).waitFor();
    await shot(page, 'review-item-noted');

    // The reports screen downloads the unit's readings and its FHIR Bundle for the chosen range.
    await page.goto(`${BASE_URL}/reports`);
    await page.getByRole('heading', { name: 'Reports', level: 1 }).waitFor();
    const [readings] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Readings CSV' }).click()]);
    assert.match(readings.suggestedFilename(), /^readings-\d{4}-\d{2}-\d{2}-\d{4}-\d{2}-\d{2}\.csv$/);
    const readingsCsv = fs.readFileSync((await readings.path())!);
    assert.deepEqual([...readingsCsv.subarray(0, 3)], [0xef, 0xbb, 0xbf]);
    assert.match(readingsCsv.subarray(3).toString('utf8'), /^reading_id,infant_id,infant,bed,/);
    const [fhir] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'FHIR R4 (JSON)' }).click()]);
    const bundle = JSON.parse(fs.readFileSync((await fhir.path())!, 'utf8')) as { resourceType: string; entry: unknown[] };
    assert.equal(bundle.resourceType, 'Bundle');
    assert.ok(bundle.entry.length > 10);
    await page.context().close();
  });

  it("the admin invites a user; the caught e-mail's link sets a password; the new user signs in", async () => {
    const email = `rowan.ashby.${Date.now()}@warmfold.test`;
    const page = await newPage(browser, WIDE);
    await signIn(page, ACCOUNTS.admin);
    await page.waitForURL((url) => url.pathname === '/admin');
    await page.getByLabel('Full name').fill('Rowan Ashby');
    await page.getByLabel('Work e-mail').fill(email);
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page
      .getByRole('status')
      .filter({ hasText: `Invitation sent to ${email}` })
      .waitFor();
    await shot(page, 'admin-invited');
    await page.context().close();

    // The admin's mailbox shows the invitation he sent, never its link (only the invitee may set her password).
    const token = await apiToken(ACCOUNTS.admin);
    let sent: { to: string; text: string } | undefined;
    for (let i = 0; i < 40 && !sent; i++) {
      const res = await fetch(`${BASE_URL}/api/mailbox`, { headers: { Authorization: `Bearer ${token}` } });
      const { messages } = (await res.json()) as { messages: { to: string; text: string }[] };
      sent = messages.find((m) => m.to.includes(email));
      if (!sent) await new Promise((r) => setTimeout(r, 250));
    }
    assert.ok(sent, 'the invitation was caught by the local SMTP server');
    assert.doesNotMatch(sent.text, /token=/);
    // The invitee opens the link from her own inbox: the message as the catcher stored it.
    const db = new Database(path.join(process.env.E2E_DATA_DIR!, 'warmfold.db'), { readonly: true });
    const caught = db.prepare('SELECT text_body FROM caught_mail WHERE to_addresses = ? ORDER BY id DESC').get(email) as { text_body: string } | undefined;
    db.close();
    const link = caught ? /(https?:\/\/\S+\/accept-invite\?token=\S+)/.exec(caught.text_body)?.[1] : undefined;
    assert.ok(link, 'the invitee has her link');
    const url = new URL(link);

    const invitee = await newPage(browser, WIDE);
    await invitee.goto(`${BASE_URL}${url.pathname}${url.search}`);
    await invitee.getByRole('heading', { name: 'Welcome to Warmfold' }).waitFor();
    await invitee.getByLabel('New password').fill('amber-harbour-willow-42');
    await invitee.getByRole('button', { name: 'Set my password' }).click();
    await invitee.getByRole('status').filter({ hasText: 'Your password is set' }).waitFor();
    await shot(invitee, 'invite-accepted');
    await signIn(invitee, email, 'amber-harbour-willow-42');
    await invitee.waitForURL((u) => u.pathname === '/infants');
    await invitee.context().close();
  });
});
