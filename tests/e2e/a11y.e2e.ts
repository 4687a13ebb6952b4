import assert from 'node:assert/strict';
import fs from 'node:fs';
import path from 'node:path';
import { after, before, describe, it } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, PHONE, shot, signIn, WIDE } from './support';

/**
 * axe-core on every screen, at a phone and a wide screen, in the light and the night theme,
 * signed in as the role that uses the screen. The screens come from the app/ folder, so a
 * screen added later is checked without anyone remembering to list it here.
 */

type Role = keyof typeof ACCOUNTS | 'anonymous';
interface ScreenCase {
  name: string;
  path: string;
  role: Role;
}
interface Violation {
  screen: string;
  size: string;
  scheme: string;
  id: string;
  impact: string;
  help: string;
  targets: string[];
  summary: string;
}

const AXE = path.join('node_modules', 'axe-core', 'axe.min.js');
const TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'];
const SAMPLE_INFANT = 'inf-ashgrove';
/**
 * Counted by hand: the 18 routes under app/ (all but `/`, which only redirects), the not-found
 * page, Settings for the charge nurse, the educator and the administrator, the board for a nurse
 * and the unit handover for a charge nurse. A new screen raises the count the sweep finds; a
 * sweep that finds fewer (a broken walk of app/, a route it could not open) fails.
 */
const SCREENS_AT_LEAST = 24;
const SIZES = 2;
const THEMES = 2;

/** Every route file under app/, as a URL pattern ("/infants/[id]/record"). */
function routesFromAppFolder(): string[] {
  const root = path.join(process.cwd(), 'app');
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (/\.tsx?$/.test(entry.name) && !/^_layout\.|^\+html\.|^\+not-found\./.test(entry.name) && !/\.(web|native|ios|android)\.tsx?$/.test(entry.name)) {
        const rel = path
          .relative(root, full)
          .replace(/\.tsx?$/, '')
          .split(path.sep);
        const segments = rel.filter((s) => !/^\(.*\)$/.test(s) && s !== 'index');
        out.push(`/${segments.join('/')}`);
      }
    }
  };
  walk(root);
  return out.sort();
}

/** Who uses a screen: the role the test signs in as. */
function roleFor(route: string): Role {
  if (route === '/sign-in' || /^\/(invite|invitation|accept|reset|password)/.test(route)) return 'anonymous';
  if (route.startsWith('/admin')) return 'admin';
  if (route.startsWith('/review') || route.startsWith('/reports')) return 'educator';
  if (route.startsWith('/board') || route.startsWith('/readings-import')) return 'charge';
  return 'nurse';
}

async function api<T>(pathname: string, token: string): Promise<T> {
  const res = await fetch(`${BASE_URL}/api${pathname}`, { headers: { Authorization: `Bearer ${token}` } });
  assert.equal(res.status, 200, `${pathname} answered ${res.status}`);
  return (await res.json()) as T;
}

/** Concrete URLs for the screens; a route whose parameters we cannot fill is reported, not hidden. */
async function screenCases(): Promise<{ cases: ScreenCase[]; skipped: string[] }> {
  const nurse = await apiToken(ACCOUNTS.nurse);
  const flowsheet = await api<{ readings: { id: string }[] }>(`/infants/${SAMPLE_INFANT}/flowsheet?hours=12`, nurse);
  const educator = await apiToken(ACCOUNTS.educator);
  const queue = await api<{ items: { flagId: string }[] }>('/review/queue', educator).catch(() => ({ items: [] }));
  // Parameters by the folder they sit in: review/[id] is a flag, everything else an infant.
  const params = (route: string): Record<string, string | undefined> => ({
    id: route.startsWith('/review/') ? queue.items[0]?.flagId : SAMPLE_INFANT,
    readingId: flowsheet.readings.at(-1)?.id,
  });
  const cases: ScreenCase[] = [{ name: 'not-found', path: '/no/such/page', role: 'anonymous' }];
  const skipped: string[] = [];
  for (const route of routesFromAppFolder()) {
    if (route === '/') continue; // redirects to each role's home, which is listed on its own
    let missing = false;
    const concrete = route.replace(/\[(?:\.\.\.)?(\w+)\]/g, (_m, key: string) => {
      const value = params(route)[key];
      if (!value) missing = true;
      return value ?? '';
    });
    if (missing) {
      skipped.push(route);
      continue;
    }
    cases.push({ name: route.slice(1).replace(/\[|\]/g, '').replace(/\//g, '-') || 'home', path: concrete, role: roleFor(route) });
  }
  // Each role's home is also its Settings; check Settings as every signed-in role.
  for (const role of ['charge', 'educator', 'admin'] as const) cases.push({ name: `settings-${role}`, path: '/settings', role });
  // The nurse also reads the board on a phone.
  cases.push({ name: 'board-nurse', path: '/board', role: 'nurse' });
  // The charge nurse's handover offers the whole unit as well as her own infants.
  cases.push({ name: 'handover-charge', path: '/handover', role: 'charge' });
  return { cases, skipped };
}

/** The screen is drawn and its data has arrived (no spinner left). */
async function settle(page: Page): Promise<void> {
  await page.locator('h1, [role="heading"][aria-level="1"]').first().waitFor({ timeout: 12_000 });
  await page.waitForLoadState('networkidle').catch(() => undefined);
  await page
    .waitForFunction(() => ![...document.querySelectorAll('[role="progressbar"]')].some((el) => (el as HTMLElement).offsetParent !== null), undefined, { timeout: 10_000 })
    .catch(() => undefined);
  await page.evaluate(() => document.fonts.ready);
  await page.waitForTimeout(250);
}

/** Visible controls smaller than 44x44 CSS px. */
async function smallTargets(page: Page): Promise<{ what: string; size: string }[]> {
  return page.evaluate(() => {
    const selector =
      'a[href], button, input:not([type="hidden"]), textarea, select, [role="button"], [role="link"], [role="radio"], [role="checkbox"], [role="switch"], [role="tab"]';
    const out: { what: string; size: string }[] = [];
    for (const el of document.querySelectorAll<HTMLElement>(selector)) {
      if (el.offsetParent === null || el.getAttribute('aria-hidden') === 'true') continue;
      const r = el.getBoundingClientRect();
      if (r.width === 0 || r.height === 0) continue;
      if (r.width < 43.5 || r.height < 43.5) {
        const name = el.getAttribute('aria-label') ?? (el.textContent ?? '').trim().slice(0, 40);
        out.push({ what: `${el.getAttribute('role') ?? el.tagName.toLowerCase()} "${name}"`, size: `${Math.round(r.width)}x${Math.round(r.height)}` });
      }
    }
    return out;
  });
}

interface AxeResult {
  violations: { id: string; impact: string | null; help: string; nodes: { target: unknown[]; failureSummary?: string }[] }[];
}

async function runAxe(page: Page): Promise<AxeResult> {
  const loaded = await page.evaluate(() => typeof (window as unknown as { axe?: unknown }).axe !== 'undefined');
  if (!loaded) await page.addScriptTag({ path: AXE });
  return page.evaluate(
    (tags) =>
      (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<AxeResult> } }).axe.run(document, {
        runOnly: { type: 'tag', values: tags },
        resultTypes: ['violations'],
      }),
    TAGS,
  );
}

/** Like support's newPage, but the test may inject axe past the product's CSP (script-src 'self'). */
async function newPage(browser: Browser, viewport: { width: number; height: number }, colorScheme: 'light' | 'dark'): Promise<Page> {
  const context = await browser.newContext({ viewport, colorScheme, bypassCSP: true });
  const page = await context.newPage();
  page.setDefaultTimeout(15_000);
  return page;
}

let browser: Browser;
const violations: Violation[] = [];
const checked = new Set<string>();
let plan: { cases: ScreenCase[]; skipped: string[] };

before(async () => {
  browser = await launch();
  plan = await screenCases();
});
after(async () => {
  await browser.close();
});

describe('accessibility (axe, WCAG 2.2 A and AA)', () => {
  for (const size of [
    { name: 'phone', viewport: PHONE },
    { name: 'wide', viewport: WIDE },
  ]) {
    // Each screen is opened once per size and checked in both themes: the emulated colour
    // scheme is switched in place (the app follows the system theme), which halves the page loads.
    it(`every screen at ${size.name} size, in the light and the dark theme`, async () => {
      const roles: Role[] = ['anonymous', 'nurse', 'charge', 'educator', 'admin'];
      for (const role of roles) {
        const cases = plan.cases.filter((c) => c.role === role);
        if (cases.length === 0) continue;
        const page = await newPage(browser, size.viewport, 'light');
        if (role !== 'anonymous') await signIn(page, ACCOUNTS[role]);
        for (const screen of cases) {
          await page.emulateMedia({ colorScheme: 'light' });
          let loadError: string | null = null;
          try {
            await page.goto(`${BASE_URL}${screen.path}`);
            if (screen.path === '/sign-in' || screen.name === 'not-found') {
              await page
                .getByText(/Sign in|This page is not here/)
                .first()
                .waitFor();
              await page.waitForTimeout(300);
            } else {
              await settle(page);
            }
          } catch (err) {
            loadError = String(err).split('\n')[0]!;
          }
          for (const scheme of ['light', 'dark'] as const) {
            const record = (id: string, impact: string, help: string, targets: string[] = [], summary = '') =>
              violations.push({ screen: screen.name, size: size.name, scheme, id, impact, help, targets, summary });
            // A screen that never shows its level-1 heading is itself a finding; axe still runs on what is there.
            if (loadError) record('screen-heading-missing', 'serious', `no level-1 heading appeared: ${loadError}`);
            if (scheme === 'dark') {
              await page.emulateMedia({ colorScheme: 'dark' });
              // The page's colour scheme follows once the app has re-rendered (a night-shift board is dark already).
              const followed = await page
                .waitForFunction(() => getComputedStyle(document.documentElement).colorScheme === 'dark', undefined, { timeout: 5000 })
                .then(
                  () => true,
                  () => false,
                );
              if (!followed) record('theme-not-followed', 'serious', 'the screen stayed light when the system asked for dark');
              await page.waitForTimeout(150);
            }
            const result = await runAxe(page);
            checked.add(`${screen.name}@${size.name}/${scheme}`);
            for (const v of result.violations) {
              record(
                v.id,
                v.impact ?? 'unknown',
                v.help,
                v.nodes.map((n) => JSON.stringify(n.target)),
                (v.nodes[0]?.failureSummary ?? '').replace(/\s+/g, ' ').slice(0, 240),
              );
            }
            // Gloved hands: every control at least 44x44 CSS px (axe's target-size asks only 24).
            if (scheme === 'light') {
              for (const small of await smallTargets(page)) record('touch-target-44', 'serious', `control smaller than 44x44 px: ${small.size}`, [small.what]);
            }
            await shot(page, `a11y-${screen.name}-${size.name}-${scheme}`);
          }
        }
        await page.context().close();
      }
    });
  }

  it('holds at 320 px wide with no sideways scrolling (sign-in, My infants)', async () => {
    const narrow = { width: 320, height: 640 };
    for (const scheme of ['light', 'dark'] as const) {
      const page = await newPage(browser, narrow, scheme);
      await page.goto(`${BASE_URL}/sign-in`);
      await page.getByRole('button', { name: 'Sign in' }).waitFor();
      const signInWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      assert.ok(signInWidth <= 320, `sign-in scrolls sideways at 320 px (${signInWidth} px wide) in ${scheme}`);
      await shot(page, `a11y-narrow-sign-in-${scheme}`);
      await signIn(page, ACCOUNTS.nurse);
      await page.waitForURL((url) => url.pathname === '/infants');
      await settle(page);
      const infantsWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      assert.ok(infantsWidth <= 320, `My infants scrolls sideways at 320 px (${infantsWidth} px wide) in ${scheme}`);
      await shot(page, `a11y-narrow-my-infants-${scheme}`);
      await page.context().close();
    }
  });

  it('holds at 200 % text size (page zoom) on sign-in and My infants', async () => {
    // 200 % zoom of a 1280 px window leaves 640 CSS px; the layout must reflow, not clip.
    const page = await newPage(browser, { width: 640, height: 450 }, 'light');
    await page.goto(`${BASE_URL}/sign-in`);
    await page.getByRole('button', { name: 'Sign in' }).waitFor();
    assert.ok((await page.evaluate(() => document.documentElement.scrollWidth)) <= 640, 'sign-in reflows at 200 %');
    await signIn(page, ACCOUNTS.nurse);
    await settle(page);
    assert.ok((await page.evaluate(() => document.documentElement.scrollWidth)) <= 640, 'My infants reflows at 200 %');
    await shot(page, 'a11y-zoom-200-my-infants');
    await page.context().close();
  });

  it('reports the screens checked and finds no violations', () => {
    const lines = violations.map(
      (v) =>
        `  - [${v.impact}] ${v.id} on ${v.screen} (${v.size}, ${v.scheme}): ${v.help}\n      targets: ${v.targets.slice(0, 4).join(' ')}${v.targets.length > 4 ? ` (+${v.targets.length - 4} more)` : ''}\n      ${v.summary}`,
    );
    const screens = new Set([...checked].map((c) => c.split('@')[0]));
    console.log(`a11y: ${screens.size} screens checked (${checked.size} screen x size x theme runs), ${violations.length} violations`);
    if (plan.skipped.length) console.log(`a11y: not checked (no sample parameters): ${plan.skipped.join(', ')}`);
    if (lines.length) console.log(lines.join('\n'));
    fs.writeFileSync(
      path.join(process.env.E2E_ARTIFACTS ?? path.join('tests', 'e2e', 'artifacts'), 'a11y-report.json'),
      JSON.stringify({ checked: [...checked], violations }, null, 2),
    );
    // No violations means nothing if nothing was looked at: every screen, at both sizes, in both themes.
    assert.deepEqual(plan.skipped, [], 'every route under app/ is opened with sample parameters');
    assert.ok(screens.size >= SCREENS_AT_LEAST, `${screens.size} screens checked, expected at least ${SCREENS_AT_LEAST}`);
    assert.equal(checked.size, screens.size * SIZES * THEMES, 'each screen checked at both sizes in both themes');
    assert.equal(screens.size, plan.cases.length, 'every planned screen was checked');
    assert.equal(violations.length, 0, `${violations.length} accessibility violations; see the list above`);
  });
});
