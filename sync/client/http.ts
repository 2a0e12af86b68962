import { SignedOutError, SyncHttpError, UnsupportedVersionError } from "./errors";

// What the device's sync calls share about reading an answer: status first, then content type,
// then shape. Nothing counts as acknowledged until all three are right.

export type FetchFn = (input: string, init?: RequestInit) => Promise<Response>;

export const defaultFetch = (): FetchFn => globalThis.fetch.bind(globalThis) as FetchFn;

export const isJson = (res: Response) =>
  /^application\/(?:[\w.+-]+\+)?json(?:;|$)/i.test((res.headers.get("content-type") ?? "").trim());

/** POSTs JSON to the app; a failure to reach it becomes SyncHttpError with a null status. */
export async function postJson(doFetch: FetchFn, url: string, body: unknown, timeoutMs: number) {
  return doFetch(url, {
    method: "POST",
    credentials: "same-origin",
    cache: "no-store",
    headers: { "content-type": "application/json", accept: "application/json" },
    body: JSON.stringify(body),
    signal: AbortSignal.timeout(timeoutMs),
  }).catch((err: unknown) => {
    throw new SyncHttpError("Could not reach the server.", null, { cause: err });
  });
}

/** The body of a JSON answer, or null when it is not JSON (a sign-in page, a proxy's error page). */
export async function readJson(res: Response): Promise<Record<string, unknown> | null> {
  if (res.redirected || !isJson(res)) return null;
  try {
    const body = (await res.json()) as unknown;
    return body && typeof body === "object" ? (body as Record<string, unknown>) : null;
  } catch (err) {
    // A body cut off half-way is a network failure: the request may or may not have been applied.
    throw new SyncHttpError("The server's answer was cut off.", null, { cause: err });
  }
}

export const errorText = (body: Record<string, unknown> | null) =>
  typeof body?.error === "string" ? body.error : null;

// 401 is always "signed out"; 409/426 (once a push has looked for a gap) is a version refusal.
export function refuse(status: number, body: Record<string, unknown> | null): never {
  if (status === 401) throw new SignedOutError();
  if (status === 409 || status === 426) {
    throw new UnsupportedVersionError(
      errorText(body) ?? "The server does not accept this version of the field app. Reload it.",
    );
  }
  const message = errorText(body);
  throw new SyncHttpError(`The server answered ${status}${message ? `: ${message}` : "."}`, status);
}
