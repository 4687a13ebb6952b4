import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, newPage, PHONE, shot, signIn } from './support';

// The charge nurse's wall board, read from across the room. Sizes: WCAG 2.2 and common practice
// for wall displays (labels and countdowns at least 32 px, flag words at least 20 px on 1920x1080).

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

interface ApiBed {
  label: string;
  tier: number;
  infant: { displayName: string } | null;
}

async function apiBoard(): Promise<ApiBed[]> {
  const token = await apiToken(ACCOUNTS.charge);
  const res = await fetch(`${BASE_URL}/api/units/unit-north/board`, { headers: { Authorization: `Bearer ${token}` } });
  assert.equal(res.status, 200);
  return ((await res.json()) as { beds: ApiBed[] }).beds;
}

async function openBoard(page: Page): Promise<void> {
  await signIn(page, ACCOUNTS.charge);
  await page.goto(`${BASE_URL}/board`);
  await page.getByRole('list', { name: /Beds, most urgent first/ }).waitFor();
  await page.getByTestId('bed-N01').waitFor();
}

/** Every tile's box: all of them inside the viewport, none needing a scroll. */
async function tileBoxes(page: Page, viewport: { width: number; height: number }) {
  const tiles = page.locator('[role="listitem"][data-testid^="bed-"]');
  const count = await tiles.count();
  const boxes = [];
  for (let i = 0; i < count; i++) {
    const box = await tiles.nth(i).boundingBox();
    assert.ok(box, `tile ${i} has a box`);
    boxes.push({ label: (await tiles.nth(i).getAttribute('data-testid'))!.slice(4), ...box });
  }
  for (const b of boxes) {
    assert.ok(
      b.y >= 0 && b.y + b.height <= viewport.height + 0.5,
      `bed ${b.label} is inside the screen's height (${Math.round(b.y)}–${Math.round(b.y + b.height)} of ${viewport.height})`,
    );
    assert.ok(b.x >= 0 && b.x + b.width <= viewport.width + 0.5, `bed ${b.label} is inside the screen's width`);
  }
  return boxes;
}

for (const viewport of [
  { width: 1440, height: 900 },
  { width: 1920, height: 1080 },
]) {
  describe(`the wall board at ${viewport.width}x${viewport.height}`, () => {
    it('shows every bed of the 14-bed unit without scrolling, most urgent first', async () => {
      const page = await newPage(browser, viewport);
      await openBoard(page);
      const api = await apiBoard();
      assert.equal(api.length, 14, 'the demo unit has 14 beds');
      const boxes = await tileBoxes(page, viewport);
      assert.equal(boxes.length, 14);
      // Reading order (rows top to bottom, left to right) is the server's order of urgency.
      const reading = [...boxes].sort((a, b) => (Math.abs(a.y - b.y) < 4 ? a.x - b.x : a.y - b.y)).map((b) => b.label);
      assert.deepEqual(
        reading,
        api.map((b) => b.label),
      );
      const tiers = api.map((b) => b.tier);
      assert.deepEqual(
        tiers,
        [...tiers].sort((a, b) => a - b),
        'tiers never go back up',
      );
      // Filters fold away behind one control.
      assert.equal(await page.getByRole('radio', { name: 'Needs attention' }).count(), 0);
      await page.getByRole('button', { name: /^Filters/ }).waitFor();
      // The last row's tiles are as tall as the others (no stretching).
      const heights = new Set(boxes.map((b) => Math.round(b.height)));
      assert.equal(heights.size, 1, `one tile height, got ${[...heights].join(', ')}`);
      const widths = new Set(boxes.map((b) => Math.round(b.width)));
      assert.equal(widths.size, 1, `one tile width, got ${[...widths].join(', ')}`);
      // Countdowns are words, never a clock-like time.
      for (const text of await page.getByTestId('bed-countdown').allInnerTexts()) {
        assert.doesNotMatch(text, /\d:\d\d/, `countdown "${text}"`);
      }
      const overdue = await page
        .getByTestId('bed-countdown')
        .filter({ hasText: /Overdue/ })
        .allInnerTexts();
      assert.ok(overdue.length > 0 && overdue.every((t) => /^Overdue by \d+ (min|h)/.test(t)), `overdue countdowns: ${overdue.join(' | ')}`);
      if (viewport.width === 1920) {
        const size = (testId: string) => page.getByTestId(testId).evaluateAll((els) => els.map((e) => parseFloat(getComputedStyle(e).fontSize)));
        for (const px of await size('bed-label')) assert.ok(px >= 32, `bed label ${px} px`);
        for (const px of await size('bed-countdown')) assert.ok(px >= 32, `countdown ${px} px`);
        const flags = await size('bed-flag');
        assert.ok(flags.length > 0, 'the demo shows flag words');
        for (const px of flags) assert.ok(px >= 20, `flag words ${px} px`);
      }
      await shot(page, `wall-board-${viewport.width}x${viewport.height}`);
      await page.context().close();
    });
  });
}

describe('admitting and warming from the board', () => {
  it('on a phone the beds come first; Admit opens in view with focus inside and gives it back on close', async () => {
    const page = await newPage(browser, PHONE);
    await openBoard(page);
    // The first bed is on the first screen, above any filter.
    const first = await page.locator('[role="listitem"][data-testid^="bed-"]').first().boundingBox();
    assert.ok(first && first.y < PHONE.height / 2, 'the first bed is in the top half of the first screen');
    await shot(page, 'wall-board-phone');
    const admit = page.getByRole('button', { name: 'Admit to N14' });
    await admit.scrollIntoViewIfNeeded();
    await admit.click();
    const dialog = page.getByRole('dialog', { name: /^Bed N14/ });
    await dialog.waitFor();
    const box = await dialog.boundingBox();
    assert.ok(box && box.y >= 0 && box.y < PHONE.height, 'the dialog is on screen where she is looking');
    assert.ok(await page.evaluate(() => document.activeElement?.closest('[role="dialog"]') !== null), 'focus moved into the dialog');
    await shot(page, 'wall-board-phone-admit');
    await page.keyboard.press('Escape');
    await dialog.waitFor({ state: 'detached' });
    assert.ok(await admit.evaluate((el) => el === document.activeElement || el.contains(document.activeElement)), 'focus is back on Admit');
    await page.context().close();
  });

  it('a warmed bed shows on its tile and its settings are in the admission; the new infant is marked as having no nurse', async () => {
    const page = await newPage(browser, { width: 1440, height: 900 });
    await openBoard(page);
    await page.getByRole('button', { name: 'Admit to N13' }).click();
    const dialog = page.getByRole('dialog', { name: /^Bed N13/ });
    await dialog.getByRole('button', { name: 'Warm N13 for an admission' }).click();
    await dialog.getByRole('radio', { name: 'Radiant warmer' }).first().click();
    await dialog.getByRole('radio', { name: 'Skin servo' }).first().click();
    await dialog
      .getByLabel(/^Set temperature/)
      .first()
      .fill('36.5');
    await dialog.getByLabel(/^Expected infant/).fill('Twin 2 from delivery suite');
    await dialog.getByRole('button', { name: 'Warm N13' }).click();
    const tile = page.getByTestId('bed-N13');
    await tile.getByText(/Warming for an admission/).waitFor();
    assert.match(await tile.innerText(), /Radiant warmer, skin servo, set 36\.5\s°C · for Twin 2 from delivery suite/);
    await shot(page, 'wall-board-warming');
    await page.getByRole('button', { name: 'Admit to N13' }).click();
    const admitDialog = page.getByRole('dialog', { name: /^Bed N13/ });
    // The admission starts from the warming's settings.
    const set = admitDialog.getByRole('textbox', { name: /^Set temperature/ }).last();
    assert.equal(await set.inputValue(), '36.5');
    await admitDialog.getByLabel('Display name').fill('Baby Tamsworth');
    await admitDialog.getByLabel('Hospital number').fill('LV-300451');
    // Born yesterday evening (the form reads the device's local time).
    const y = new Date(Date.now() - 86_400_000);
    await admitDialog.getByLabel('Date of birth').fill(`${y.getFullYear()}-${String(y.getMonth() + 1).padStart(2, '0')}-${String(y.getDate()).padStart(2, '0')}`);
    await admitDialog.getByLabel('Time of birth').fill('21:05');
    await admitDialog.getByLabel(/Gestation: weeks/).fill('35');
    await admitDialog.getByLabel(/Birth weight/).fill('2410');
    await admitDialog.getByRole('button', { name: 'Admit to N13' }).click();
    await admitDialog.waitFor({ state: 'detached' });
    const admitted = page.getByTestId('bed-N13');
    await admitted.getByText('Baby Tamsworth').waitFor();
    await admitted.getByText('No nurse assigned').waitFor();
    await page.context().close();
  });
});
