import type { ApiErrorBody } from '@/shared/api';
import { takeEarlyAnswer, takeEarlyRead, type EarlyAnswer } from './early-requests';

/** Every way a request can fail, as the screens need to tell them apart. */
export type ApiProblem =
  | { kind: 'cannot-connect'; message: string }
  | { kind: 'unauthorized'; message: string }
  | { kind: 'forbidden'; message: string }
  | { kind: 'not-found'; message: string }
  | { kind: 'conflict'; message: string; fields?: Record<string, string> }
  | { kind: 'invalid'; message: string; fields: Record<string, string> }
  | { kind: 'too-many-requests'; message: string; retryAfterSeconds: number | null }
  | { kind: 'server-error'; message: string };

export class ApiFailure extends Error {
  constructor(readonly problem: ApiProblem) {
    super(problem.message);
  }
}

/** Retry-After is whole seconds or an HTTP date (RFC 9110 §10.2.3); anything else says nothing. */
function secondsToWait(retryAfter: string | null): number | null {
  const text = retryAfter?.trim() ?? '';
  if (/^\d+$/.test(text)) return Number(text);
  const at = Date.parse(text);
  return Number.isNaN(at) ? null : Math.max(0, Math.ceil((at - Date.now()) / 1000));
}

export function problemFromStatus(status: number, body: Partial<ApiErrorBody> | null, retryAfter: string | null): ApiProblem {
  const message = body?.error?.message ?? `The server answered ${status}.`;
  const fields = body?.error?.fields ?? {};
  if (status === 401) return { kind: 'unauthorized', message };
  if (status === 403) return { kind: 'forbidden', message };
  if (status === 404) return { kind: 'not-found', message };
  if (status === 409) return { kind: 'conflict', message, fields };
  if (status === 429) return { kind: 'too-many-requests', message, retryAfterSeconds: secondsToWait(retryAfter) };
  if (status >= 400 && status < 500) return { kind: 'invalid', message, fields };
  return { kind: 'server-error', message };
}

type TokenSource = () => string | null;
type UnauthorizedHandler = () => void;

let tokenSource: TokenSource = () => null;
let onUnauthorized: UnauthorizedHandler = () => {};

/** The auth provider tells the client where the token is and what to do on a 401. */
export function configureApi(options: { token: TokenSource; onUnauthorized: UnauthorizedHandler }): void {
  tokenSource = options.token;
  onUnauthorized = options.onUnauthorized;
}

export const API_BASE = process.env.EXPO_PUBLIC_API_URL ?? '';

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  body?: unknown;
  signal?: AbortSignal;
  /** Sign-in's own 401 means "wrong password", not "signed out". */
  skipUnauthorizedHandler?: boolean;
}

/** The page's early answer for a GET of `path` for the signed-in token, if it has arrived already (early-requests.ts). */
export function earlyAnswer(path: string): EarlyAnswer | null {
  return takeEarlyAnswer(path, tokenSource());
}

/** One request: resolves with the JSON data, or rejects with an ApiFailure carrying a typed problem. */
export async function api<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  const token = tokenSource();
  if (token) headers.Authorization = `Bearer ${token}`;
  let payload: BodyInit | undefined;
  if (options.body instanceof FormData) payload = options.body;
  else if (options.body !== undefined) {
    headers['Content-Type'] = 'application/json';
    payload = JSON.stringify(options.body);
  }
  let response: Response;
  try {
    const early = (options.method ?? 'GET') === 'GET' ? takeEarlyRead(path, token) : null;
    response =
      (early ? await early.catch(() => null) : null) ??
      (await fetch(`${API_BASE}/api${path}`, { method: options.method ?? 'GET', headers, body: payload, signal: options.signal }));
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err;
    throw new ApiFailure({ kind: 'cannot-connect', message: 'Cannot reach Warmfold. Check the connection; nothing was lost.' });
  }
  if (response.status === 204) return undefined as T;
  let json: unknown = null;
  try {
    json = await response.json();
  } catch {
    json = null;
  }
  if (!response.ok) {
    const problem = problemFromStatus(response.status, json as Partial<ApiErrorBody> | null, response.headers.get('Retry-After'));
    if (problem.kind === 'unauthorized' && !options.skipUnauthorizedHandler) onUnauthorized();
    throw new ApiFailure(problem);
  }
  return json as T;
}

/** A GET whose answer is a file (a CSV, a FHIR Bundle): its text and the file name the server gave it. */
export async function apiFile(path: string): Promise<{ text: string; filename: string | null }> {
  const headers: Record<string, string> = {};
  const token = tokenSource();
  if (token) headers.Authorization = `Bearer ${token}`;
  let response: Response;
  try {
    response = await fetch(`${API_BASE}/api${path}`, { headers });
  } catch {
    throw new ApiFailure({ kind: 'cannot-connect', message: 'Cannot reach Warmfold. Check the connection; nothing was lost.' });
  }
  if (!response.ok) {
    const json = (await response.json().catch(() => null)) as Partial<ApiErrorBody> | null;
    const problem = problemFromStatus(response.status, json, response.headers.get('Retry-After'));
    if (problem.kind === 'unauthorized') onUnauthorized();
    throw new ApiFailure(problem);
  }
  const filename = /filename="([^"]+)"/.exec(response.headers.get('Content-Disposition') ?? '')?.[1] ?? null;
  return { text: await response.text(), filename };
}

export function problemOf(error: unknown): ApiProblem {
  if (error instanceof ApiFailure) return error.problem;
  return { kind: 'server-error', message: error instanceof Error ? error.message : 'Something went wrong.' };
}
