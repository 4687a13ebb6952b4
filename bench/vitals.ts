/**
 * Core Web Vitals in Debian's Chromium under Lighthouse's mobile settings, set through the
 * DevTools protocol: a 412x823 phone at DPR 1.75, 150 ms round trips, 1.6 Mbps down, 750 kbps
 * up and a 4x CPU slowdown. Each run is a fresh browser context; before each measured page the
 * HTTP cache is cleared, so every page is a cold load as Lighthouse measures it. The sign-in
 * token stays in localStorage, as it does for a nurse who signed in earlier in the shift.
 */
import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type CDPSession, type Page } from 'playwright-core';
import { untilCompressed } from './server';

export const MOBILE = {
  width: 412,
  height: 823,
  deviceScaleFactor: 1.75,
  latencyMs: 150,
  downloadBytesPerSec: (1.6 * 1024 * 1024) / 8,
  uploadBytesPerSec: (750 * 1024) / 8,
  cpuSlowdown: 4,
} as const;

export interface PageSample {
  lcp: number | null;
  cls: number;
  /** Which element was the LCP and where its time went (web-vitals' attribution). */
  lcpWhat: string | null;
  /** Same-origin scripts the page loaded, as paths: the route's initial JavaScript. */
  scripts: string[];
}

export interface VitalsRun {
  signIn: PageSample;
  myInfants: PageSample;
  flowsheet: PageSample;
  /** The slowest interaction while opening the record form, typing and saving, in ms. */
  inp: number | null;
  /** Which interaction that was and where its time went (web-vitals' attribution). */
  inpWhat: string | null;
}

const COLLECTOR = `
  window.__vitals = { lcp: null, lcpWhat: null, lcpText: null, cls: 0, inp: null, inpWhat: null, maxEvent: 0, slowestEvent: null };
  webVitals.onLCP((m) => {
    window.__vitals.lcp = m.value;
    const a = m.attribution;
    window.__vitals.lcpWhat = a ? (a.target || 'unknown element') + ': first byte ' + Math.round(a.timeToFirstByte) + ' + render delay ' + Math.round(a.elementRenderDelay) + ' ms' : null;
    const el = a && a.lcpEntry && a.lcpEntry.element;
    window.__vitals.lcpText = el ? (el.textContent || '').trim().slice(0, 60) : null;
  }, { reportAllChanges: true });
  webVitals.onCLS((m) => { window.__vitals.cls = m.value; }, { reportAllChanges: true });
  // The attribution build says which interaction was slowest and where its time went.
  webVitals.onINP((m) => {
    if (window.__vitals.inp !== null && m.value < window.__vitals.inp) return;
    window.__vitals.inp = m.value;
    const a = m.attribution;
    window.__vitals.inpWhat = a ? a.interactionType + ': input delay ' + Math.round(a.inputDelay) + ' + processing ' + Math.round(a.processingDuration) + ' + presentation ' + Math.round(a.presentationDelay) + ' ms' : null;
  }, { reportAllChanges: true });
  // web-vitals leaves out interactions under its reporting threshold; keep the raw maximum too,
  // so a fast page reads as its real duration rather than as nothing.
  try {
    new PerformanceObserver((list) => {
      for (const e of list.getEntries()) {
        if (!e.interactionId || e.duration < window.__vitals.maxEvent) continue;
        window.__vitals.maxEvent = e.duration;
        // Named now: the element may be gone (a screen replaced) by the time INP is reported.
        const t = e.target;
        const label = t && t.nodeType === 1 ? (t.getAttribute('aria-label') || (t.textContent || '').trim().slice(0, 40) || t.tagName.toLowerCase()) : null;
        window.__vitals.slowestEvent = e.name + (label ? ' on "' + label + '"' : '');
      }
    }).observe({ type: 'event', durationThreshold: 16, buffered: true });
  } catch (_) {}
`;

async function throttle(cdp: CDPSession): Promise<void> {
  await cdp.send('Network.enable');
  await cdp.send('Network.emulateNetworkConditions', {
    offline: false,
    latency: MOBILE.latencyMs,
    downloadThroughput: MOBILE.downloadBytesPerSec,
    uploadThroughput: MOBILE.uploadBytesPerSec,
  });
  await cdp.send('Emulation.setCPUThrottlingRate', { rate: MOBILE.cpuSlowdown });
  await cdp.send('Emulation.setDeviceMetricsOverride', { width: MOBILE.width, height: MOBILE.height, deviceScaleFactor: MOBILE.deviceScaleFactor, mobile: true });
}

interface Vitals {
  lcp: number | null;
  lcpWhat: string | null;
  lcpText: string | null;
  cls: number;
  inp: number | null;
  inpWhat: string | null;
  maxEvent: number;
  slowestEvent: string | null;
}

/** What app/(app)/_layout.tsx shows while a signed-in page waits for its user. */
const OPENING_PLACEHOLDER = 'Opening Warmfold';

const read = (page: Page) => page.evaluate(() => (window as unknown as { __vitals: Vitals }).__vitals);

/** Load `url` cold, let the network settle, check that the page shows `ready`, then read LCP and CLS. */
async function coldLoad(page: Page, cdp: CDPSession, url: string, ready: (page: Page) => Promise<void>): Promise<PageSample> {
  await cdp.send('Network.clearBrowserCache');
  const scripts = new Set<string>();
  const origin = new URL(url).origin;
  const onResponse = (res: { url(): string }) => {
    const u = new URL(res.url());
    if (u.origin === origin && u.pathname.endsWith('.js')) scripts.add(u.pathname);
  };
  page.on('response', onResponse);
  await page.goto(url, { waitUntil: 'load', timeout: 120_000 });
  // Nothing touches the page while it loads: Playwright's text lookups poll the DOM, and at 4x
  // CPU those polls delayed the page's own rendering (about 0.15 s of My infants' LCP). The page
  // is left until the network settles, then checked for what it should show.
  await page.waitForLoadState('networkidle', { timeout: 120_000 }).catch(() => undefined);
  await page.waitForTimeout(500);
  await ready(page);
  page.off('response', onResponse);
  const v = await read(page);
  // The page's own content was waited for above; an LCP still on the signed-in pages' "Opening
  // Warmfold…" placeholder means Chromium recorded no entry for that content, and the figure
  // would flatter the page. Such a run is an error (tried again once), never a sample.
  if (v.lcpText !== null && v.lcpText.startsWith(OPENING_PLACEHOLDER)) throw new Error(`${url}: the LCP entry is the opening placeholder, not the page's content`);
  return { lcp: v.lcp, lcpWhat: v.lcpText ? `${v.lcpWhat} ("${v.lcpText}")` : v.lcpWhat, cls: v.cls, scripts: [...scripts] };
}

export interface VitalsOptions {
  base: string;
  runs: number;
  email: string;
  password: string;
  infantId: string;
  /** A name shown in the nurse's list, to know the list has rendered. */
  infantName: string;
  executablePath?: string;
}

async function oneRun(browser: Browser, opts: VitalsOptions, iife: string): Promise<VitalsRun> {
  const context: BrowserContext = await browser.newContext({
    viewport: { width: MOBILE.width, height: MOBILE.height },
    deviceScaleFactor: MOBILE.deviceScaleFactor,
    isMobile: true,
    hasTouch: true,
  });
  try {
    // One script: each init script runs in its own scope, so a second could not see `webVitals`.
    await context.addInitScript({ content: `${iife}\n;${COLLECTOR}` });
    const page = await context.newPage();
    page.setDefaultTimeout(60_000);
    const cdp = await context.newCDPSession(page);
    await throttle(cdp);

    const signIn = await coldLoad(page, cdp, `${opts.base}/sign-in`, async (p) => {
      await p.getByRole('button', { name: 'Sign in' }).waitFor();
    });
    await page.getByLabel('E-mail').fill(opts.email);
    await page.getByLabel('Password', { exact: true }).fill(opts.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
    // Signing in lands on My infants; let that page finish (its list shown, the network quiet)
    // before the next cold load. Navigating while it is still rendering timed the old page's
    // work as the new page's (about 0.3 s at 4x) and sometimes lost the new page's LCP entry.
    await page.getByText(opts.infantName, { exact: false }).first().waitFor();
    await page.waitForLoadState('networkidle').catch(() => undefined);

    const myInfants = await coldLoad(page, cdp, `${opts.base}/infants`, async (p) => {
      await p.getByText(opts.infantName, { exact: false }).first().waitFor();
    });
    const flowsheet = await coldLoad(page, cdp, `${opts.base}/infants/${opts.infantId}`, async (p) => {
      await p.getByRole('button', { name: 'Record', exact: true }).waitFor();
    });

    // Record a reading: open the form, type, choose the site, save.
    await page.getByRole('button', { name: 'Record', exact: true }).click();
    const probe = page.getByLabel('Probe temperature (°C)');
    await probe.waitFor();
    await probe.pressSequentially('36.8', { delay: 50 });
    const remote = page.getByLabel('Remote-site temperature (°C)');
    await remote.click();
    await remote.pressSequentially('36.9', { delay: 50 });
    // The remote site's Axilla comes first; the probe site's Axilla follows in the placement settings.
    await page
      .getByRole('radio', { name: /Axilla/ })
      .first()
      .click();
    await page.getByRole('button', { name: 'Save reading' }).click();
    // An unusual pre-filled value asks for a confirmation first; that is one more interaction.
    const confirm = page.getByRole('button', { name: 'Confirm and save' });
    if (
      await confirm.waitFor({ state: 'visible', timeout: 1500 }).then(
        () => true,
        () => false,
      )
    )
      await confirm.click();
    await page.waitForURL((url) => !url.pathname.endsWith('/record'));
    await page.getByRole('button', { name: 'Record', exact: true }).waitFor();
    await page.waitForTimeout(300);
    const v = await read(page);
    const inp = v.inp ?? (v.maxEvent > 0 ? v.maxEvent : null);
    const what = [v.slowestEvent, v.inpWhat].filter(Boolean).join('; ');
    return { signIn, myInfants, flowsheet, inp, inpWhat: what || null };
  } catch (err) {
    // What the page showed when a step timed out, for whoever reads the failure.
    const page = context.pages()[0];
    if (page) await page.screenshot({ path: path.join('bench', 'results', 'vitals-failure.png') }).catch(() => undefined);
    throw err;
  } finally {
    await context.close();
  }
}

/**
 * An unmeasured pass over the same pages, unthrottled, before any measured run. The server
 * compresses its whole build at start-up (brotli at quality 11) on libuv's thread pool; on a
 * loaded 2-core machine that takes tens of seconds, and file reads for the first page queue
 * behind it. A nurse's server has been up for days, so the first measured page waiting on that
 * measured the bench, not the app (a 59 s "LCP" for sign-in). Every script, font and image the
 * pages asked for is then polled until it is served brotli-compressed from memory.
 */
async function warmUp(browser: Browser, opts: VitalsOptions): Promise<void> {
  const deadline = Date.now() + 300_000;
  const html = await (await fetch(`${opts.base}/sign-in`)).text();
  for (const m of html.matchAll(/<script[^>]+src="([^"]+)"/g)) await untilCompressed(new URL(m[1]!, opts.base).href, deadline);
  const context = await browser.newContext({ viewport: { width: MOBILE.width, height: MOBILE.height } });
  const urls = new Set<string>();
  try {
    const page = await context.newPage();
    page.setDefaultTimeout(120_000);
    page.on('response', (res) => {
      const u = new URL(res.url());
      if (u.origin === opts.base && /^\/(_expo|assets)\//.test(u.pathname)) urls.add(u.href);
    });
    await page.goto(`${opts.base}/sign-in`);
    await page.getByLabel('E-mail').fill(opts.email);
    await page.getByLabel('Password', { exact: true }).fill(opts.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
    await page.goto(`${opts.base}/infants`);
    await page.getByText(opts.infantName, { exact: false }).first().waitFor();
    await page.goto(`${opts.base}/infants/${opts.infantId}`);
    await page.getByRole('button', { name: 'Record', exact: true }).waitFor();
    await page.waitForLoadState('networkidle').catch(() => undefined);
  } finally {
    await context.close();
  }
  for (const url of urls) await untilCompressed(url, deadline);
}

export async function benchVitals(opts: VitalsOptions, log: (line: string) => void): Promise<VitalsRun[]> {
  const iife = fs.readFileSync(path.join('node_modules', 'web-vitals', 'dist', 'web-vitals.attribution.iife.js'), 'utf8');
  const browser = await chromium.launch({
    executablePath: opts.executablePath ?? process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  const runs: VitalsRun[] = [];
  try {
    const warmStart = performance.now();
    await warmUp(browser, opts);
    log(`  warm-up pass (unmeasured): ${((performance.now() - warmStart) / 1000).toFixed(1)} s`);
    for (let i = 0; i < opts.runs; i++) {
      let run: VitalsRun;
      try {
        run = await oneRun(browser, opts, iife);
      } catch (err) {
        // A run that stalls (a page that never shows its content) is reported and tried once more
        // in a fresh context; a second failure ends the bench with the error.
        log(`  vitals run ${i + 1}/${opts.runs} failed, trying again once: ${err instanceof Error ? err.message.split('\n')[0] : String(err)}`);
        run = await oneRun(browser, opts, iife);
      }
      log(
        `  vitals run ${i + 1}/${opts.runs}: LCP sign-in ${fmt(run.signIn.lcp)}, my infants ${fmt(run.myInfants.lcp)}, flowsheet ${fmt(run.flowsheet.lcp)}; INP ${fmt(run.inp)}${run.inpWhat ? ` (${run.inpWhat})` : ''}`,
      );
      for (const [label, sample] of [
        ['sign-in', run.signIn],
        ['my infants', run.myInfants],
        ['flowsheet', run.flowsheet],
      ] as const) {
        if (sample.lcpWhat) log(`    LCP ${label}: ${sample.lcpWhat}`);
      }
      runs.push(run);
    }
  } finally {
    await browser.close();
  }
  return runs;
}

const fmt = (ms: number | null) => (ms === null ? 'n/a' : `${Math.round(ms)} ms`);
