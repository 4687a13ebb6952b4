import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, newPage, PASSWORD, PHONE, shot, signIn, WIDE } from './support';

/**
 * The three everyday jobs done with the keyboard alone in Chromium: sign in, a routine check
 * at the bedside, and the board. Every stop on the way must show a visible focus ring.
 */

interface Focused {
  /** The bed tile the focus sits in, if any ("bed-N01"). */
  tile: string | null;
  tag: string;
  role: string | null;
  name: string;
  ring: boolean;
}

/** What has the focus now, its accessible-ish name, and whether a focus ring is drawn. */
async function focused(page: Page): Promise<Focused> {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    if (!el || el === document.body) return { tile: null, tag: 'body', role: null, name: '', ring: false };
    const cs = getComputedStyle(el);
    const outline = cs.outlineStyle !== 'none' && parseFloat(cs.outlineWidth) >= 2;
    const shadow = cs.boxShadow !== 'none' && cs.boxShadow !== '';
    const labelledBy = el.getAttribute('aria-labelledby');
    const name = el.getAttribute('aria-label') ?? (labelledBy ? (document.getElementById(labelledBy)?.textContent ?? '') : '');
    const tile = el.closest('[data-testid^="bed-"]')?.getAttribute('data-testid') ?? null;
    return { tile, tag: el.tagName.toLowerCase(), role: el.getAttribute('role'), name: name || (el.textContent ?? '').trim().slice(0, 80), ring: outline || shadow };
  });
}

/** Press Tab until the focused element matches; every stop on the way must show a focus ring. */
async function tabTo(page: Page, match: (f: Focused) => boolean, what: string, maxStops = 80): Promise<Focused> {
  const seen: string[] = [];
  for (let i = 0; i < maxStops; i++) {
    await page.keyboard.press('Tab');
    const f = await focused(page);
    seen.push(`${f.role ?? f.tag}:${f.name}`);
    assert.ok(f.tag === 'body' || f.ring, `no visible focus ring on ${f.role ?? f.tag} "${f.name}"`);
    if (match(f)) return f;
  }
  assert.fail(`${what} was not reached by Tab within ${maxStops} stops; stops were: ${seen.join(' | ')}`);
}

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

describe('keyboard alone (Chromium)', () => {
  it('signs in: Tab to each field, type, Enter', async () => {
    const page = await newPage(browser, PHONE);
    await page.goto(`${BASE_URL}/sign-in`);
    await page.getByRole('button', { name: 'Sign in' }).waitFor();
    await tabTo(page, (f) => f.tag === 'input' && f.name === 'E-mail', 'the e-mail field');
    await page.keyboard.type(ACCOUNTS.nurse);
    await tabTo(page, (f) => f.tag === 'input' && f.name === 'Password', 'the password field', 3);
    await page.keyboard.type(PASSWORD);
    await shot(page, 'keyboard-sign-in');
    await page.keyboard.press('Enter');
    await page.waitForURL((url) => url.pathname === '/infants');
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    await page.context().close();
  });

  it('works the board: Tab through the filters, choose one, reach and use Acknowledge', async () => {
    const page = await newPage(browser, WIDE);
    await signIn(page, ACCOUNTS.charge);
    await page.waitForURL((url) => url.pathname === '/board');
    await page.getByRole('heading', { name: 'Unit board', level: 1 }).waitFor();
    await page.locator('[data-testid^="bed-"]').first().waitFor();

    // The filters fold away behind one button: Tab to it and open it with Enter.
    await tabTo(page, (f) => f.role === 'button' && f.name.startsWith('Filters'), 'the Filters button');
    await page.keyboard.press('Enter');
    await page.getByRole('radiogroup', { name: 'Show' }).waitFor();
    // The filters are one radio group: Tab reaches it once, at the chosen filter, and the arrow
    // keys move the choice (and the focus with it) to "Needs attention".
    const first = await tabTo(page, (f) => f.role === 'radio', 'the board filters');
    assert.equal(await page.getByRole('radio', { name: first.name }).getAttribute('aria-checked'), 'true', 'Tab lands on the chosen filter');
    const needsAttention = page.getByRole('radio', { name: 'Needs attention' });
    for (let i = 0; i < 8 && (await needsAttention.getAttribute('aria-checked')) !== 'true'; i++) await page.keyboard.press('ArrowRight');
    await needsAttention.and(page.locator('[aria-checked="true"]')).waitFor();
    assert.equal(await needsAttention.evaluate((el) => el === document.activeElement), true, 'the focus follows the choice');
    // One Tab leaves the group: on to the next group ("Nurse"), at its chosen option.
    await page.keyboard.press('Tab');
    const next = await page.evaluate(() => ({
      group: document.activeElement?.closest('[role="radiogroup"]')?.getAttribute('aria-label') ?? null,
      checked: document.activeElement?.getAttribute('aria-checked') ?? null,
    }));
    assert.notEqual(next.group, 'Show', 'one Tab leaves the filter group');
    if (next.group !== null) assert.equal(next.checked, 'true', 'Tab lands on the chosen option of the next group');
    const shown = await page.locator('[data-testid^="bed-"]').count();
    assert.ok(shown > 0, 'the beds that need attention are shown');
    await shot(page, 'keyboard-board-filter');

    // On through the tiles to an escalation still waiting to be seen. N02's is left for the
    // board story (tests/e2e/board.e2e.ts), which may run after this file on the same server.
    const target = await tabTo(page, (f) => f.name === 'Acknowledge' && f.tile !== 'bed-N02', 'an "Acknowledge" button');
    await shot(page, 'keyboard-board-acknowledge-focused');
    const bedId = target.tile;
    assert.ok(bedId, 'the Acknowledge button sits in a bed tile');
    await page.keyboard.press('Enter');
    await page
      .getByTestId(bedId)
      .getByText(/acknowledged by Marta Lindqvist/i)
      .first()
      .waitFor()
      .catch(async (err: Error) => {
        await shot(page, 'keyboard-board-acknowledge-failed');
        const tile = await page
          .getByTestId(bedId)
          .innerText()
          .catch(() => '(no such tile on the board)');
        throw new Error(`${err.message}\nThe tile says: ${tile}`);
      });
    await page.context().close();
  });

  it('records a routine check: My infants, Tab to an infant, Enter, Record, probe, Tab, remote site, Enter through the remaining fields', async () => {
    // Another story may have left this nurse on °F; this one types °C.
    const token = await apiToken(ACCOUNTS.nurse);
    const prefs = await fetch(`${BASE_URL}/api/auth/me/preferences`, {
      method: 'PATCH',
      headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
      body: JSON.stringify({ tempUnit: 'C' }),
    });
    assert.equal(prefs.status, 200);
    const page = await newPage(browser, PHONE);
    await signIn(page, ACCOUNTS.nurse);
    await page.waitForURL((url) => url.pathname === '/infants');
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    await page.getByRole('link', { name: /^N03, Baby Cinderford/ }).waitFor();

    await tabTo(page, (f) => /^N03, Baby Cinderford/.test(f.name), 'the N03 infant');
    await page.keyboard.press('Enter');
    await page.waitForURL((url) => url.pathname === '/infants/inf-cinderford');
    await page.getByRole('heading', { name: /Baby Cinderford/, level: 1 }).waitFor();

    await tabTo(page, (f) => f.name === 'Record', 'the Record button');
    await page.keyboard.press('Enter');
    await page.waitForURL((url) => url.pathname === '/infants/inf-cinderford/record');
    // The form puts the caret in the probe field; if not, Tab to it.
    const probe = page.getByLabel(/^Probe temperature/);
    await probe.waitFor();
    if (!(await probe.evaluate((el) => el === document.activeElement))) await tabTo(page, (f) => /^Probe temperature/.test(f.name), 'the probe field');
    await page.keyboard.type('36.8');
    await tabTo(page, (f) => /^Remote-site temperature/.test(f.name), 'the remote-site field', 3);
    await page.keyboard.type('36.6');
    await shot(page, 'keyboard-record');
    // Enter moves through air, heater output and heart rate, and saves from the last.
    for (let i = 0; i < 4; i += 1) await page.keyboard.press('Enter');
    await page.waitForURL((url) => url.pathname === '/infants/inf-cinderford');
    await page
      .getByText(/36\.8\s°C/)
      .first()
      .waitFor();
    await shot(page, 'keyboard-record-saved');
    await page.context().close();
  });
});
