import assert from 'node:assert/strict';
import fs from 'node:fs';
import path from 'node:path';
import { after, before, describe, it } from 'node:test';
import type { Browser } from 'playwright-core';
import { extractText } from 'unpdf';
import { ACCOUNTS, apiToken, ARTIFACTS, BASE_URL, launch, newPage, signIn, WIDE } from './support';

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

describe('the printed unit handover', () => {
  it('starts with a one-page summary of every bed, then a page per infant with its plan and "printed at, by" with the bed and name on every page', async () => {
    const page = await newPage(browser, WIDE);
    await signIn(page, ACCOUNTS.charge);
    await page.goto(`${BASE_URL}/handover`);
    await page
      .getByRole('radio', { name: /Whole unit|Unit/ })
      .first()
      .click();
    await page.getByRole('table', { name: /Unit summary/ }).waitFor();
    // A plan written on the handover screen is printed on the infant's page.
    const plan = page.getByRole('textbox', { name: 'Plan for the next shift' }).first();
    await plan.fill('Recheck the probe contact at 02:00; wean the set temperature if the remote site stays above 37.2.');
    await page.getByRole('button', { name: 'Save plan' }).first().click();
    await page
      .getByText(/Written by Marta Lindqvist/)
      .first()
      .waitFor({ state: 'attached' });

    // She prints it later in the shift: "printed at" is when it is printed, not when it was opened.
    const token = await apiToken(ACCOUNTS.charge);
    const board = (await (await fetch(`${BASE_URL}/api/units/unit-north/board`, { headers: { Authorization: `Bearer ${token}` } })).json()) as { unit: { timeZone: string } };
    const printAt = new Date(Date.now() + (2 * 60 + 17) * 60_000);
    await page.clock.setFixedTime(printAt);
    // The unit's clock time, by the browser's own Intl (the demo users read a 24-hour clock).
    const hhmm = new Intl.DateTimeFormat('en-GB', { hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZone: board.unit.timeZone }).format(printAt);

    await page.emulateMedia({ media: 'print' });
    const pdf = await page.pdf({ format: 'A4', printBackground: false });
    fs.writeFileSync(path.join(ARTIFACTS, 'handover-unit.pdf'), pdf);
    // The text of each page, read by a registry PDF library (unpdf, Mozilla's PDF.js), not by the app.
    const { totalPages, text } = await extractText(new Uint8Array(pdf), { mergePages: false });
    const pages = text as string[];
    const infants = (await page.getByRole('article', { name: /^Handover for / }).count()) as number;
    assert.ok(infants >= 8, `the demo unit has 8 infants, got ${infants}`);
    assert.ok(totalPages >= infants + 1, `a summary page and at least one page per infant (${totalPages} pages)`);
    assert.match(pages[0]!, /Unit summary/);
    assert.match(pages[0]!, /N01/);
    assert.match(pages[0]!, /N08/);
    assert.match(pages[0]!, new RegExp(`printed at ${hhmm}\\b.* by Marta Lindqvist`, 'i'));
    // The summary fits one page: the second page is an infant's.
    assert.doesNotMatch(pages[1]!, /Unit summary/);
    for (const [i, p] of pages.slice(1).entries()) {
      assert.match(p, /N\d\d · Baby /, `page ${i + 2} names the bed and the infant`);
      assert.match(p, new RegExp(`printed at ${hhmm}\\b.* by Marta Lindqvist`, 'i'), `page ${i + 2} says when and by whom it was printed`);
    }
    assert.ok(
      pages.some((p) => /Recheck the probe contact at 02:00/.test(p)),
      'the plan is printed',
    );
    await page.context().close();
  });
});
