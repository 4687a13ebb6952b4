import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';

export const BASE_URL = process.env.BASE_URL ?? 'http://127.0.0.1:8080';
export const ARTIFACTS = process.env.E2E_ARTIFACTS ?? path.join('tests', 'e2e', 'artifacts');
export const PASSWORD = 'warm-hands-at-night';

export const ACCOUNTS = {
  nurse: 'nia.okafor@warmfold.test',
  charge: 'marta.lindqvist@warmfold.test',
  educator: 'priya.raman@warmfold.test',
  admin: 'tomas.vidal@warmfold.test',
} as const;

export const PHONE = { width: 390, height: 844 } as const;
export const WIDE = { width: 1440, height: 900 } as const;

/** Debian's Chromium, started with the flags this closed network needs. */
export async function launch(): Promise<Browser> {
  // Playwright gives every launch a fresh, empty profile of its own.
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

export async function newPage(browser: Browser, viewport: { width: number; height: number }, colorScheme: 'light' | 'dark' = 'light'): Promise<Page> {
  const context = await browser.newContext({ viewport, colorScheme });
  const page = await context.newPage();
  page.setDefaultTimeout(15_000);
  return page;
}

export async function signIn(page: Page, email: string, password = PASSWORD): Promise<void> {
  await page.goto(`${BASE_URL}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
}

export async function shot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  const file = path.join(ARTIFACTS, `${name}.png`);
  await page.screenshot({ path: file, fullPage: false });
  return file;
}

/** A token for API calls the story needs to set up (for example a user's settings). */
export async function apiToken(email: string, password = PASSWORD): Promise<string> {
  const res = await fetch(`${BASE_URL}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (!res.ok) throw new Error(`sign-in ${email}: ${res.status}`);
  return ((await res.json()) as { token: string }).token;
}
