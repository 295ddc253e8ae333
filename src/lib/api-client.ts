// The one typed fetch helper: JSON in and out, and the API's error shape turned into ApiError.
import type { ApiErrorBody, ErrorCode } from '@/shared/errors';

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode | 'network',
    message: string,
    readonly fields: Record<string, string> = {},
    readonly requestId?: string,
    /** Recovery data the server sends with some errors, e.g. the current text on a 409. */
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
  }
}

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  body?: unknown;
  signal?: AbortSignal;
}

export async function api<T>(path: string, opts: RequestOptions = {}): Promise<T> {
  return readAnswer<T>(
    sendRequest(path, {
      method: opts.method ?? 'GET',
      credentials: 'same-origin',
      headers: opts.body === undefined ? { Accept: 'application/json' } : { Accept: 'application/json', 'Content-Type': 'application/json' },
      body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
      signal: opts.signal,
    }),
  );
}

/**
 * A GET with no headers of our own, so that it takes over the response of a preload hint the server
 * put in the page for it (the browser reuses a preloaded response only for a request like the hint's).
 */
export function apiPlainGet<T>(path: string): Promise<T> {
  return readAnswer<T>(sendRequest(path, { credentials: 'same-origin' }));
}

async function sendRequest(path: string, init: RequestInit): Promise<Response> {
  try {
    return await fetch(path, init);
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err;
    throw new ApiError(0, 'network', 'Beadpath cannot reach the server. Check the connection and try again.');
  }
}

async function readAnswer<T>(sent: Promise<Response>): Promise<T> {
  const res = await sent;
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  let data: unknown = undefined;
  try {
    data = text ? JSON.parse(text) : undefined;
  } catch {
    data = undefined;
  }
  if (!res.ok) {
    const e = (data as ApiErrorBody | undefined)?.error;
    throw new ApiError(res.status, e?.code ?? 'internal', e?.message ?? `The server answered ${res.status} ${res.statusText}`, e?.fields ?? {}, e?.requestId, e?.details);
  }
  return data as T;
}

export function errorMessage(err: unknown): string {
  if (err instanceof ApiError) return err.message;
  if (err instanceof Error) return err.message;
  return 'Something went wrong';
}
