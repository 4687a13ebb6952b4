import assert from 'node:assert/strict';
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { after, before, describe, it } from 'node:test';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { ACCOUNTS, apiToken, BASE_URL, launch, PASSWORD, PHONE, shot, signIn } from './support';

let browser: Browser;
before(async () => {
  browser = await launch();
});
after(async () => {
  await browser.close();
});

/** Wait until the service worker controls the page (it registers after load, when the browser is idle). */
async function controlled(page: Page): Promise<void> {
  await page.waitForFunction(() => navigator.serviceWorker?.controller !== null && navigator.serviceWorker?.controller !== undefined, null, { timeout: 30_000 });
}

async function readingsOf(infantId: string): Promise<{ id: string }[]> {
  const token = await apiToken(ACCOUNTS.nurse);
  const res = await fetch(`${BASE_URL}/api/infants/${infantId}/flowsheet?hours=72`, { headers: { Authorization: `Bearer ${token}` } });
  assert.equal(res.status, 200);
  return ((await res.json()) as { readings: { id: string }[] }).readings;
}

describe('an installed app with no connection', () => {
  it('opens My infants, the flowsheet and the record form offline, and sends a reading kept on the phone when the connection returns', async () => {
    const context: BrowserContext = await browser.newContext({ viewport: PHONE });
    let page = await context.newPage();
    page.setDefaultTimeout(15_000);

    // Online once: sign in, open My infants and a flowsheet (as a nurse does at the start of a shift).
    await signIn(page, ACCOUNTS.nurse);
    await page.goto(`${BASE_URL}/infants`);
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    const manifest = await page.locator('link[rel="manifest"]').getAttribute('href');
    assert.equal(manifest, '/manifest.webmanifest');
    const installable = (await (await fetch(`${BASE_URL}/manifest.webmanifest`)).json()) as { display: string; icons: { sizes: string }[] };
    // Installability (web app manifest, W3C): a standalone display and a 192 and 512 px icon.
    assert.equal(installable.display, 'standalone');
    assert.ok(installable.icons.some((i) => i.sizes === '192x192') && installable.icons.some((i) => i.sizes === '512x512'));
    await controlled(page);
    await page.reload();
    await page.getByRole('link', { name: /^N01, / }).click();
    await page.getByRole('heading', { level: 1 }).waitFor();
    const infantId = new URL(page.url()).pathname.split('/')[2]!;
    await page.getByRole('button', { name: 'Record', exact: true }).waitFor();
    const before = (await readingsOf(infantId)).length;
    // The flowsheet reads the record form's defaults ahead, so the form opens offline too.
    await page.waitForFunction(async (id) => (await (await caches.open('warmfold-api')).keys()).some((r) => new URL(r.url).pathname === `/api/infants/${id}`), infantId, {
      timeout: 15_000,
    });
    // The stored answers never include the session check (/api/auth is never kept).
    const kept = await page.evaluate(async () => (await (await caches.open('warmfold-api')).keys()).map((r) => new URL(r.url).pathname));
    assert.ok(
      kept.some((p) => p.startsWith('/api/infants')),
      `API answers kept: ${kept.join(', ')}`,
    );
    assert.ok(!kept.some((p) => p.startsWith('/api/auth')), `no /api/auth answer kept: ${kept.join(', ')}`);
    await page.close();

    // The phone loses its signal; the app is started again from its icon.
    await context.setOffline(true);
    page = await context.newPage();
    page.setDefaultTimeout(15_000);
    await page.goto(`${BASE_URL}/infants`);
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    await page.getByRole('link', { name: /^N01, / }).waitFor();
    await shot(page, 'offline-1-my-infants');
    await page.getByRole('link', { name: /^N01, / }).click();
    await page.getByRole('button', { name: 'Record', exact: true }).click();
    const probe = page.getByLabel(/^Probe temperature/);
    await probe.waitFor();
    await shot(page, 'offline-2-record-form');
    await probe.fill('36.8');
    await page.keyboard.press('Tab');
    await page.getByLabel(/^Remote-site temperature/).fill('36.6');
    await page.getByRole('button', { name: 'Save reading' }).click();
    await page.getByText('Not yet saved').first().waitFor();
    await shot(page, 'offline-3-kept-on-phone');
    assert.equal((await readingsOf(infantId)).length, before, 'nothing reached the server while offline');

    // The signal returns: the kept reading goes out by itself.
    await context.setOffline(false);
    await page.getByText('Not yet saved').first().waitFor({ state: 'detached', timeout: 45_000 });
    assert.equal((await readingsOf(infantId)).length, before + 1, 'the reading kept on the phone was sent once');
    await shot(page, 'offline-4-sent');

    // Signing out forgets every stored API answer on the phone.
    await page.goto(`${BASE_URL}/settings`);
    await page.getByRole('button', { name: 'Sign out' }).first().click();
    await page.waitForURL((url) => url.pathname.startsWith('/sign-in'));
    await page.waitForFunction(async () => (await (await caches.open('warmfold-api')).keys()).length === 0, null, { timeout: 10_000 });
    await context.close();
  });
  it('sends a reading kept on the phone when the connection returns while My infants is open, not the record form', async () => {
    const context: BrowserContext = await browser.newContext({ viewport: PHONE });
    const page = await context.newPage();
    page.setDefaultTimeout(15_000);
    await signIn(page, ACCOUNTS.nurse);
    await page.goto(`${BASE_URL}/infants`);
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    await controlled(page);
    await page.getByRole('link', { name: /^N03, / }).click();
    await page.getByRole('heading', { level: 1 }).waitFor();
    const infantId = new URL(page.url()).pathname.split('/')[2]!;
    const before = (await readingsOf(infantId)).length;
    await page.getByRole('button', { name: 'Record', exact: true }).click();
    const probe = page.getByLabel(/^Probe temperature/);
    await probe.waitFor();

    // The signal goes while she charts; the reading stays on the phone.
    await context.setOffline(true);
    await probe.fill('36.9');
    await page.keyboard.press('Tab');
    await page.getByLabel(/^Remote-site temperature/).fill('36.7');
    await page.getByRole('button', { name: 'Save reading' }).click();
    await page.getByText('Not yet saved').first().waitFor();
    assert.equal((await readingsOf(infantId)).length, before, 'nothing reached the server while offline');

    // She moves on to My infants (the flowsheet and the record form are gone from the screen);
    // the list says a reading of N03 is waiting.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'My infants' }).click();
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    const n03 = page.getByRole('link', { name: /^N03, / });
    await n03.getByText('1 not yet saved').waitFor();
    assert.equal(await page.getByRole('button', { name: 'Save reading' }).count(), 0, 'the record form is closed');
    await shot(page, 'offline-5-waiting-on-my-infants');

    // The signal returns with My infants open: the reading goes out by itself, once.
    await context.setOffline(false);
    await n03.getByText('1 not yet saved').waitFor({ state: 'detached', timeout: 45_000 });
    const after = await readingsOf(infantId);
    assert.equal(after.length, before + 1, 'the reading kept on the phone was stored once');
    await context.close();
  });
});

function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const srv = net.createServer();
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
  });
}

/** The built server (as `npm start` runs it) on its own port, data folder and copy of the web build. */
async function startServer(env: Record<string, string>): Promise<ChildProcess> {
  const child = spawn('node', [path.join('build', 'server', 'index.js')], { env: { ...process.env, HOST: '127.0.0.1', LOG_REQUESTS: 'false', ...env }, stdio: 'ignore' });
  const deadline = Date.now() + 60_000;
  for (;;) {
    try {
      if ((await fetch(`http://127.0.0.1:${env.PORT}/api/health`)).ok) return child;
    } catch {
      // not up yet
    }
    assert.ok(Date.now() < deadline && child.exitCode === null, 'the second server started');
    await new Promise((r) => setTimeout(r, 250));
  }
}

async function stopServer(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null) return;
  child.kill('SIGTERM');
  await new Promise((r) => child.once('exit', r));
}

describe('a new build of Warmfold', () => {
  // A second server of the same build, on a copy of the web build: the story swaps in a new build
  // by changing that copy. The cheapest faithful new build: one page changes and the service
  // worker's list of files to keep gives it a new revision, as the build writes it (the worker
  // script's bytes change, which is what makes a browser install a new worker).
  const work = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-update-'));
  const web = path.join(work, 'web');
  let server: ChildProcess | null = null;
  after(async () => {
    if (server) await stopServer(server);
    fs.rmSync(work, { recursive: true, force: true });
  });

  it('waits for the nurse: the update line appears, Reload switches to the new build, and the new build stays in control', async () => {
    fs.cpSync(path.resolve('dist'), web, { recursive: true });
    const env = { PORT: String(await freePort()), SMTP_PORT: String(await freePort()), DATA_DIR: path.join(work, 'data'), WEB_DIR: web };
    const base = `http://127.0.0.1:${env.PORT}`;
    server = await startServer(env);

    const context = await browser.newContext({ viewport: PHONE });
    const page = await context.newPage();
    page.setDefaultTimeout(15_000);
    await page.goto(`${base}/sign-in`);
    await page.getByLabel('E-mail').fill(ACCOUNTS.nurse);
    await page.getByLabel('Password', { exact: true }).fill(PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
    await page.goto(`${base}/infants`);
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    await controlled(page);
    const banner = page.getByText(/A new version of Warmfold is ready/);
    assert.equal(await banner.count(), 0, 'no update line while the build is the one installed');

    // The new build: a changed page, and a worker listing it under a new revision.
    await stopServer(server);
    const marker = `<!-- build ${Date.now()} -->`;
    fs.appendFileSync(path.join(web, 'settings.html'), marker);
    const sw = fs.readFileSync(path.join(web, 'sw.js'), 'utf8');
    const entry = /\{"revision":"([0-9a-f]+)","url":"settings\.html"\}/.exec(sw);
    assert.ok(entry, 'the worker lists settings.html with its revision');
    fs.writeFileSync(path.join(web, 'sw.js'), sw.replace(entry[0], entry[0].replace(entry[1], 'f'.repeat(entry[1].length))));
    server = await startServer(env);

    // The next visit finds the new worker; it waits, and the nurse is told once it is ready.
    await page.reload();
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    await banner.waitFor({ timeout: 30_000 });
    await shot(page, 'offline-6-new-version-ready');
    assert.equal(await page.evaluate(async () => (await navigator.serviceWorker.getRegistration())?.waiting?.state), 'installed', 'the new worker waits');

    // Reload: the new worker takes over and the page loads again under it.
    await Promise.all([page.waitForEvent('load', { timeout: 30_000 }), page.getByRole('button', { name: 'Reload' }).click()]);
    await page.getByRole('heading', { name: 'My infants', level: 1 }).waitFor();
    await page.waitForFunction(async () => {
      const reg = await navigator.serviceWorker.getRegistration();
      return !!navigator.serviceWorker.controller && !reg?.waiting && reg?.active?.state === 'activated';
    });
    assert.equal(await banner.count(), 0, 'the update line is gone');
    // The build in control is the new one: its kept copy of the changed page is the new page.
    const kept = await page.evaluate(async () => {
      for (const name of await caches.keys()) {
        if (!name.includes('precache')) continue;
        const cache = await caches.open(name);
        for (const request of await cache.keys()) if (new URL(request.url).pathname === '/settings.html') return (await (await cache.match(request))!.text()).slice(-60);
      }
      return null;
    });
    assert.ok(kept?.includes(marker), `the kept settings page is the new build's (${kept})`);
    await context.close();
  });
});
