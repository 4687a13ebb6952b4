import assert from 'node:assert/strict';
import { after, before, describe, it } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { randomUUID } from 'node:crypto';
import { admitCrowdedInfant } from './crowded-bed';
import { ACCOUNTS, apiToken, BASE_URL, launch, newPage, PHONE, shot, signIn } from './support';

// The charge nurse's wall board, read from across the room. Sizes: WCAG 2.2 and common practice
// for wall displays (labels and countdowns at least 32 px, flag words at least 20 px on 1920x1080).

let browser: Browser;
before(async () => {
  browser = await launch();
  // N12 holds an infant with five open flags (crowded-bed.ts), escalated: the fullest tile a
  // unit shows. The server escalates once a minute; wait for it so every size sees the worst case.
  await admitCrowdedInfant();
  const deadline = Date.now() + 75_000;
  while (!(await apiBoard()).find((b) => b.label === 'N12')!.escalations.some((e) => e.sentAt)) {
    assert.ok(Date.now() < deadline, 'the escalations of N12 went out within the minute');
    await new Promise((r) => setTimeout(r, 2_000));
  }
});
after(async () => {
  await browser.close();
});

interface ApiBed {
  bedId: string;
  label: string;
  tier: number;
  infant: { displayName: string; openFlags: { key: string; severity: string }[] } | null;
  escalations: { id: string; sentAt: string | null; acknowledgedAt: string | null }[];
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

/**
 * Text a tile cuts: every line of text (each line box of each text node, as the browser laid it
 * out) must lie inside its tile's border box, and every element holding text inside its width.
 * A fixed-height tile that clips a line in half, or hides a line below its edge, is reported.
 */
async function cutText(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const problems: string[] = [];
    for (const tile of Array.from(document.querySelectorAll<HTMLElement>('[role="listitem"][data-testid^="bed-"]'))) {
      const t = tile.getBoundingClientRect();
      const cs = getComputedStyle(tile);
      const top = t.top + parseFloat(cs.borderTopWidth) - 0.5;
      const bottom = t.bottom - parseFloat(cs.borderBottomWidth) + 0.5;
      const left = t.left + parseFloat(cs.borderLeftWidth) - 0.5;
      const right = t.right - parseFloat(cs.borderRightWidth) + 0.5;
      const walker = document.createTreeWalker(tile, NodeFilter.SHOW_TEXT);
      for (let node = walker.nextNode(); node; node = walker.nextNode()) {
        const text = node.textContent?.trim();
        if (!text) continue;
        const range = document.createRange();
        range.selectNodeContents(node);
        for (const line of Array.from(range.getClientRects())) {
          if (line.height === 0) continue;
          if (line.top < top || line.bottom > bottom) problems.push(`${tile.dataset.testid}: "${text.slice(0, 50)}" is cut at the tile's top or bottom`);
        }
        const holder = node.parentElement!.getBoundingClientRect();
        if (holder.left < left || holder.right > right) problems.push(`${tile.dataset.testid}: "${text.slice(0, 50)}" runs past the tile's side`);
      }
    }
    return problems;
  });
}

/** The crowded bed's flags: the most severe shown, the rest counted in words, as many in all as the server holds open. */
async function checkCrowdedTile(page: Page, api: ApiBed[], atLeastOneShown: boolean) {
  const n12 = api.find((b) => b.label === 'N12')!;
  const open = n12.infant!.openFlags;
  assert.ok(open.length >= 5, `the crowded infant has five or more open flags (${open.length})`);
  const tile = page.getByTestId('bed-N12');
  const shown = await tile.getByTestId('bed-flag').allInnerTexts();
  const more = (await tile.getByTestId('bed-more-flags').innerText()).trim();
  const m = /^\+(\d+) more flags?$/.exec(more);
  assert.ok(m, `"${more}" says in words how many flags are left out`);
  assert.equal(shown.length + Number(m[1]), open.length, `${shown.length} shown and ${m[1]} left out make the ${open.length} open flags`);
  if (atLeastOneShown) assert.ok(shown.length >= 1, 'the most severe flag is shown');
  // The fever is critical (38.0 °C and over, Bedside Clinical Guidelines Partnership): it comes first.
  assert.ok(open.some((f) => f.severity === 'critical'));
  if (shown.length) assert.match(shown[0]!, /^Critical: Fever/);
}

for (const viewport of [
  { width: 1440, height: 900 },
  { width: 1920, height: 1080 },
]) {
  describe(`the wall board at ${viewport.width}x${viewport.height}`, () => {
    it('shows every bed of the 14-bed unit without scrolling, most urgent first, and no tile cuts its text', async () => {
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
      // Every infant's tile has one size, and every empty bed's one width (no stretching); empty
      // beds are shorter, so the infants get the room.
      const occupied = new Set(api.filter((b) => b.infant).map((b) => b.label));
      const sizes = (list: typeof boxes, key: 'height' | 'width') => new Set(list.map((b) => Math.round(b[key])));
      const infants = boxes.filter((b) => occupied.has(b.label));
      const empties = boxes.filter((b) => !occupied.has(b.label));
      assert.equal(sizes(infants, 'height').size, 1, `one height for the infants' tiles, got ${[...sizes(infants, 'height')].join(', ')}`);
      assert.equal(sizes(boxes, 'width').size, 1, `one tile width, got ${[...sizes(boxes, 'width')].join(', ')}`);
      if (empties.length)
        assert.ok(
          empties.every((e) => e.height <= infants[0]!.height),
          "an empty bed is never taller than an infant's",
        );
      // Nothing is cut in half or hidden past a tile's edge.
      assert.deepEqual(await cutText(page), []);
      await checkCrowdedTile(page, api, true);
      // Countdowns are words, never a clock-like time.
      for (const text of await page.getByTestId('bed-countdown').allInnerTexts()) {
        assert.doesNotMatch(text, /\d:\d\d/, `countdown "${text}"`);
      }
      const overdue = await page
        .getByTestId('bed-countdown')
        .filter({ hasText: /Overdue/ })
        .allInnerTexts();
      assert.ok(overdue.length > 0 && overdue.every((t) => /^Overdue by\s\d+\s(min|h)/.test(t)), `overdue countdowns: ${overdue.join(' | ')}`);
      // An infant with no nurse assigned is marked (N12 was admitted with none).
      await page
        .getByTestId('bed-N12')
        .getByText(/^No nurse/)
        .waitFor();
      if (viewport.width === 1920) {
        const size = (testId: string) => page.getByTestId(testId).evaluateAll((els) => els.map((e) => parseFloat(getComputedStyle(e).fontSize)));
        for (const px of await size('bed-label')) assert.ok(px >= 32, `bed label ${px} px`);
        for (const px of await size('bed-countdown')) assert.ok(px >= 32, `countdown ${px} px`);
        const flags = await size('bed-flag');
        assert.ok(flags.length > 0, 'the demo shows flag words');
        for (const px of [...flags, ...(await size('bed-more-flags'))]) assert.ok(px >= 20, `flag words ${px} px`);
      }
      await shot(page, `wall-board-${viewport.width}x${viewport.height}`);
      await page.context().close();
    });
  });
}

describe('acknowledging from the wall', () => {
  it('one tap acknowledges every escalation a tile tells in the same words', async () => {
    const page = await newPage(browser, { width: 1440, height: 900 });
    await openBoard(page);
    const before = (await apiBoard()).find((b) => b.label === 'N12')!.escalations.filter((e) => e.sentAt && !e.acknowledgedAt);
    assert.ok(before.length >= 2, `N12 has several escalations to acknowledge (${before.length})`);
    const tile = page.getByTestId('bed-N12');
    await tile.getByRole('button', { name: /^Acknowledge all \d+$/ }).click();
    await tile.getByRole('button', { name: /^Acknowledge/ }).waitFor({ state: 'detached' });
    const after = (await apiBoard()).find((b) => b.label === 'N12')!.escalations;
    for (const e of before) assert.ok(after.find((a) => a.id === e.id)?.acknowledgedAt, `escalation ${e.id} acknowledged`);
    await page.context().close();
  });
});

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
    // Just started: "under 1 min", never "0 min".
    assert.match(await tile.innerText(), /Warming for an admission, under 1 min/);
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
    await admitted.getByText(/^No nurse/).waitFor();
    await page.context().close();
  });
});

describe('who the board offers as nurses, and Manage on the wall', () => {
  it('lists only people who accepted their invitation; Manage opens in view with focus inside and gives it back on close', async () => {
    // The administrator invites a nurse to the unit; she has not accepted yet.
    const admin = await apiToken(ACCOUNTS.admin);
    const invited = await fetch(`${BASE_URL}/api/admin/users`, {
      method: 'POST',
      headers: { Authorization: `Bearer ${admin}`, 'Content-Type': 'application/json' },
      body: JSON.stringify({ name: 'Ruth Penhallow', email: 'ruth.penhallow@warmfold.test', role: 'nurse', unitIds: ['unit-north'] }),
    });
    assert.equal(invited.status, 201, `invited: ${invited.status}`);

    const page = await newPage(browser, { width: 1440, height: 900 });
    await openBoard(page);
    await page.getByRole('button', { name: /^Filters/ }).click();
    const nurses = await page.getByRole('radiogroup', { name: 'Nurse' }).getByRole('radio').allInnerTexts();
    assert.ok(
      nurses.some((n) => n.includes('Nia Okafor')),
      `the demo's nurses are offered: ${nurses.join(', ')}`,
    );
    assert.ok(!nurses.some((n) => n.includes('Ruth Penhallow')), `an invitation not yet accepted is not offered: ${nurses.join(', ')}`);
    await page.getByRole('button', { name: /^Filters/ }).click();

    // Manage from a tile of the second row: the dialog is where she looks, focus goes in and comes back.
    const manage = page.getByRole('button', { name: 'Manage bed N07' });
    await manage.click();
    const dialog = page.getByRole('dialog', { name: /^Bed N07/ });
    await dialog.waitFor();
    const box = await dialog.boundingBox();
    assert.ok(box && box.y >= 0 && box.y + Math.min(box.height, 200) <= 900, 'the dialog is on screen');
    assert.ok(await page.evaluate(() => document.activeElement?.closest('[role="dialog"]') !== null), 'focus moved into the dialog');
    const assignable = await dialog.getByRole('radiogroup', { name: 'Assigned nurse' }).getByRole('radio').allInnerTexts();
    assert.ok(!assignable.some((n) => n.includes('Ruth Penhallow')), `nobody who has not accepted can be assigned: ${assignable.join(', ')}`);
    await shot(page, 'wall-board-manage');
    await page.keyboard.press('Escape');
    await dialog.waitFor({ state: 'detached' });
    assert.ok(await manage.evaluate((el) => el === document.activeElement || el.contains(document.activeElement)), 'focus is back on Manage');
    await page.context().close();
  });
  it('shift change assigns each nurse her beds in one step, from a dialog that opens in view and gives focus back', async () => {
    const page = await newPage(browser, { width: 1440, height: 900 });
    await openBoard(page);
    const open = page.getByRole('button', { name: 'Shift change' });
    await open.click();
    const dialog = page.getByRole('dialog', { name: /^Shift change/ });
    await dialog.waitFor();
    const box = await dialog.boundingBox();
    assert.ok(box && box.y >= 0 && box.y < 900, 'the dialog is on screen');
    assert.ok(await page.evaluate(() => document.activeElement?.closest('[role="dialog"]') !== null), 'focus moved into the dialog');
    await dialog.getByRole('radio', { name: 'This shift' }).click();
    await dialog.getByRole('radiogroup', { name: 'Nurse' }).getByRole('radio', { name: 'Kofi Mensah' }).click();
    await dialog.getByRole('checkbox', { name: /^N07, / }).click();
    await dialog.getByRole('checkbox', { name: /^N08, / }).click();
    await dialog.getByRole('radiogroup', { name: 'Nurse' }).getByRole('radio', { name: 'Inês Carvalho' }).click();
    await dialog.getByRole('checkbox', { name: /^N12, / }).click();
    await dialog.getByRole('list', { name: 'Assignments to make' }).getByText('Kofi Mensah: N07, N08').waitFor();
    await shot(page, 'wall-board-shift-change');
    await dialog.getByRole('button', { name: 'Assign 3 infants' }).click();
    await dialog.waitFor({ state: 'detached' });
    assert.ok(await open.evaluate((el) => el === document.activeElement || el.contains(document.activeElement)), 'focus is back on Shift change');
    // One step, three infants, two nurses: the server holds each assignment and the tiles say it.
    const token = await apiToken(ACCOUNTS.charge);
    const res = await fetch(`${BASE_URL}/api/units/unit-north/board`, { headers: { Authorization: `Bearer ${token}` } });
    const beds = ((await res.json()) as { beds: { label: string; infant: { assignedNurse: { name: string } | null } | null }[] }).beds;
    const nurseOf = (label: string) => beds.find((b) => b.label === label)?.infant?.assignedNurse?.name;
    assert.deepEqual([nurseOf('N07'), nurseOf('N08'), nurseOf('N12')], ['Kofi Mensah', 'Kofi Mensah', 'Inês Carvalho']);
    await page.getByTestId('bed-N12').getByText('Inês Carvalho').waitFor();
    assert.equal(
      await page
        .getByTestId('bed-N12')
        .getByText(/^No nurse/)
        .count(),
      0,
      'N12 is no longer marked as having no nurse',
    );
    await page.context().close();
  });
});

describe('a full unit on the wall', () => {
  it('fourteen infants at 1440x900 and 1920x1080: every bed in one screen, no text cut, the crowded bed counts what it leaves out', async () => {
    const token = await apiToken(ACCOUNTS.charge);
    for (const bed of (await apiBoard()).filter((b) => !b.infant)) {
      const res = await fetch(`${BASE_URL}/api/units/unit-north/infants`, {
        method: 'POST',
        headers: { Authorization: `Bearer ${token}`, 'Content-Type': 'application/json' },
        body: JSON.stringify({
          bedId: bed.bedId,
          displayName: `Baby ${bed.label} ${randomUUID().slice(0, 4)}`,
          birthAt: new Date(Date.now() - 6 * 3_600_000).toISOString(),
          gestationWeeks: 36,
          gestationDays: 1,
          birthWeightGrams: 2650,
          heatSource: 'incubator',
          controlMode: 'air-servo',
          setTemperature: 32.5,
          tempUnit: 'C',
        }),
      });
      assert.equal(res.status, 201, `admitted to ${bed.label}`);
    }
    const api = await apiBoard();
    assert.ok(
      api.every((b) => b.infant),
      'every bed holds an infant',
    );
    for (const viewport of [
      { width: 1440, height: 900 },
      { width: 1920, height: 1080 },
    ]) {
      const page = await newPage(browser, viewport);
      await openBoard(page);
      await page.getByTestId('bed-N14').getByTestId('bed-countdown').waitFor();
      const boxes = await tileBoxes(page, viewport);
      assert.equal(boxes.length, 14);
      assert.equal(new Set(boxes.map((b) => Math.round(b.height))).size, 1, 'one tile height');
      assert.deepEqual(await cutText(page), []);
      await checkCrowdedTile(page, api, false);
      await shot(page, `wall-board-full-${viewport.width}x${viewport.height}`);
      await page.context().close();
    }
  });
});
