import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, PHONE, shot, signIn } from './support';

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

const INFANT = 'inf-fernhollow';

/** The infant's readings as the server has them (the widest window). */
interface Reading {
  id: string;
  rootId?: string;
  takenAt: string;
  probeCenti: number | null;
}
async function readings(token: string): Promise<Reading[]> {
  const res = await fetch(`${BASE_URL}/api/infants/${INFANT}/flowsheet?hours=72`, { headers: { Authorization: `Bearer ${token}` } });
  assert.equal(res.status, 200);
  return ((await res.json()) as { readings: Reading[] }).readings;
}

/** The readings on the chart now that were not in `before`. */
async function newSince(before: Reading[], token: string): Promise<Reading[]> {
  const known = new Set(before.map((r) => r.id));
  return (await readings(token)).filter((r) => !known.has(r.id));
}

/** An instant as HH:MM on the unit's wall clock. */
const hhmmIn = (zone: string, at: number) => new Intl.DateTimeFormat('en-GB', { timeZone: zone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(new Date(at));

/** Hours and minutes on the unit's wall clock, `minutesAhead` from now. */
function wallClock(timeZone: string, minutesAhead: number): { hhmm: string; sameDay: boolean } {
  const at = new Date(Date.now() + minutesAhead * 60_000);
  const f = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23', day: '2-digit' });
  const parts = (d: Date) => Object.fromEntries(f.formatToParts(d).map((p) => [p.type, p.value]));
  const later = parts(at);
  return { hhmm: `${later.hour}:${later.minute}`, sameDay: later.day === parts(new Date()).day };
}

const focusedLabel = (page: Page) => page.evaluate(() => document.activeElement?.getAttribute('aria-label') ?? '');

/** Whether the element's box lies inside the phone's screen (not below the fold, not under the footer). */
async function onScreen(page: Page, text: string): Promise<boolean> {
  const box = await page.getByText(text, { exact: true }).first().boundingBox();
  return box !== null && box.y >= 0 && box.y + box.height <= PHONE.height;
}

describe('date-aware times on a phone', () => {
  it('a time later than now is refused with the field in view and focused, nothing is saved; the same time yesterday is taken', async () => {
    const token = await apiToken(ACCOUNTS.nurse);
    const detail = (await (await fetch(`${BASE_URL}/api/infants/${INFANT}`, { headers: { Authorization: `Bearer ${token}` } })).json()) as { timeZone: string };
    const zone = detail.timeZone;
    // Half an hour ahead on the unit's clock; in the last minutes before its midnight there is no later time today: wait them out.
    let ahead = wallClock(zone, 30);
    while (!ahead.sameDay && !wallClock(zone, 3).sameDay) {
      await new Promise((r) => setTimeout(r, 30_000));
      ahead = wallClock(zone, 30);
    }
    const future = ahead.sameDay ? ahead.hhmm : '23:59';
    const before = await readings(token);

    // The phone is set to another zone than the unit's: the form reads the unit's wall clock.
    const context = await browser.newContext({ viewport: PHONE, timezoneId: zone === 'Pacific/Auckland' ? 'America/Chicago' : 'Pacific/Auckland' });
    const page = await context.newPage();
    page.setDefaultTimeout(15_000);
    await signIn(page, ACCOUNTS.nurse);
    await page.goto(`${BASE_URL}/infants`);
    await page.getByRole('radio', { name: 'Whole unit' }).click();
    await page.getByRole('link', { name: /^N06, Baby Fernhollow/ }).click();
    await page.getByRole('heading', { name: /Baby Fernhollow/, level: 1 }).waitFor();
    await page.getByRole('button', { name: 'Record', exact: true }).click();
    await page.getByLabel(/^Probe temperature/).fill('36.8');
    await page.getByLabel(/^Remote-site temperature/).fill('36.7');

    const time = page.getByLabel(/^Time taken/);
    await time.fill(future);
    await page.getByText(`Taken: Today, ${future}`).waitFor();
    await page.getByRole('radio', { name: 'Today', checked: true }).waitFor();

    // Save from the top of the form: the refusal brings the time into view and gives it the focus.
    await page.getByLabel(/^Probe temperature/).focus();
    await page.getByRole('button', { name: 'Save reading' }).click();
    await page.getByText('The time cannot be in the future.').waitFor();
    await page.waitForFunction(() => document.activeElement?.getAttribute('aria-label')?.startsWith('Time taken') ?? false);
    assert.ok(await onScreen(page, 'The time cannot be in the future.'), 'the error is on screen');
    assert.equal(await page.getByRole('alert').filter({ hasText: 'The time cannot be in the future.' }).count(), 1, 'the error is announced as an alert');
    assert.equal(await page.getByLabel(/^Why is this charted late/).count(), 0, 'no late-entry reason is asked for a future time');
    await shot(page, 'times-1-future-refused');

    // Nothing was saved, nor kept as pending.
    await page.waitForTimeout(500);
    assert.deepEqual(await newSince(before, token), [], 'nothing new on the chart');
    assert.equal(await page.getByText('Not yet saved').count(), 0);

    // The same time on yesterday, named: charted late, so the reason is asked and then it saves.
    await page.getByRole('radio', { name: 'Yesterday' }).click();
    await page.getByText(`Taken: Yesterday, ${future}`).waitFor();
    await page.getByRole('button', { name: 'Save reading' }).click();
    await page.getByText(/more than 10 minutes ago: say why/).waitFor();
    await page.waitForFunction(() => document.activeElement?.getAttribute('aria-label')?.startsWith('Why is this charted late') ?? false);
    assert.match(await focusedLabel(page), /^Why is this charted late/);
    await shot(page, 'times-2-late-reason');
    await page.getByLabel(/^Why is this charted late/).fill('Charted after an admission next door.');
    await page.getByRole('button', { name: 'Save reading' }).click();
    await page.getByRole('heading', { name: /Baby Fernhollow/, level: 1 }).waitFor();

    // Compared by id, not by count: over the story's seconds an old reading can leave the 72-hour window.
    let added = await newSince(before, token);
    for (let i = 0; i < 20 && added.length === 0; i++) {
      await page.waitForTimeout(250);
      added = await newSince(before, token);
    }
    assert.equal(added.length, 1, 'one new reading on the chart');
    const saved = added[0]!;
    const hoursAgo = (Date.now() - Date.parse(saved.takenAt)) / 3_600_000;
    // Yesterday at the time that was half an hour ahead today: about 23.5 hours ago, on the unit's clock.
    assert.ok(hoursAgo > 23 && hoursAgo < 24, `saved ${hoursAgo.toFixed(2)} h ago`);
    assert.equal(hhmmIn(zone, Date.parse(saved.takenAt)), future);

    // Corrected, it keeps its day: the header and the day choice say yesterday, and a new minute stays on it.
    await page.goto(`${BASE_URL}/infants/${INFANT}/correct/${saved.id}`);
    await page.getByText(`Correcting the reading of Yesterday, ${future}`).waitFor();
    await page.getByRole('radio', { name: 'Yesterday', checked: true }).waitFor();
    await page.getByLabel('What was wrong').fill('Charted a minute late.');
    const minuteEarlier = Date.parse(saved.takenAt) - 60_000;
    await page.getByLabel(/^Time taken/).fill(hhmmIn(zone, minuteEarlier));
    await page.getByText(`Taken: Yesterday, ${hhmmIn(zone, minuteEarlier)}`).waitFor();
    await shot(page, 'times-3-correction-keeps-day');
    await page.getByRole('button', { name: 'Save correction' }).click();
    await page.getByRole('heading', { name: /Baby Fernhollow/, level: 1 }).waitFor();
    const corrected = (await readings(token)).find((r) => r.rootId === saved.id || r.id === saved.id);
    assert.ok(corrected, 'the corrected reading is on the chart');
    assert.equal(corrected.takenAt, new Date(minuteEarlier).toISOString());

    // A 24-hour window always holds a midnight: the trend chart names the day under its ticks.
    const legend = page.getByText(/^Lines: probe/);
    await legend.scrollIntoViewIfNeeded();
    const dayTick = page.locator('svg tspan', { hasText: /^(Today|Yesterday)$/ }).first();
    await dayTick.waitFor();
    await dayTick.scrollIntoViewIfNeeded();
    await shot(page, 'times-4-chart-days');
    await context.close();
  });
});
