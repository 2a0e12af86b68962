// Failures of a sync call the field app tells apart: each keeps the outbox as it was.

// The session has expired (401): sign in again; nothing was acknowledged or applied.
export class SignedOutError extends Error {
  override name = "SignedOutError";
  constructor(message = "Sign in again to sync. Everything on this device is kept.") {
    super(message);
  }
}

// The server does not accept this app's protocol or schema version (409/426): update the app.
export class UnsupportedVersionError extends Error {
  override name = "UnsupportedVersionError";
}

// Any other answer the client cannot trust: a non-2xx status, a body that is not JSON (a sign-in
// page, a proxy's error page), or JSON that is not the protocol's shape.
export class SyncHttpError extends Error {
  override name = "SyncHttpError";
  constructor(
    message: string,
    readonly status: number | null,
    options?: { cause?: unknown },
  ) {
    super(message, options);
  }
}
