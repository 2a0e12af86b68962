import "server-only";
import { NextResponse } from "next/server";
import type { z } from "zod";
import type { Role } from "@/db/schema";
import { getSessionUser, type SessionUser } from "@/lib/auth/session";

// Route-handler plumbing: JSON errors (never a redirect), capped and validated bodies, and a wrapper
// that logs unexpected failures before answering 500.

export const MAX_JSON_BYTES = 64 * 1024;

export interface Issue {
  path: string;
  message: string;
}

export function jsonError(status: number, error: string, issues?: Issue[]) {
  return NextResponse.json(issues ? { error, issues } : { error }, { status });
}

export const unauthorized = () => jsonError(401, "Sign in to continue.");
export const forbidden = () => jsonError(403, "You do not have permission to do that.");
export const notFoundJson = (what = "record") => jsonError(404, `No such ${what}.`);

export function zodIssues(error: z.ZodError): Issue[] {
  return error.issues.map((i) => ({ path: i.path.join("."), message: i.message }));
}

type Parsed<T> = { ok: true; data: T } | { ok: false; response: NextResponse };

export async function parseJson<S extends z.ZodType>(
  req: Request,
  schema: S,
  maxBytes = MAX_JSON_BYTES,
): Promise<Parsed<z.infer<S>>> {
  const type = req.headers.get("content-type") ?? "";
  if (!type.includes("application/json")) {
    return { ok: false, response: jsonError(415, "Send the body as application/json.") };
  }
  const declared = Number(req.headers.get("content-length") ?? "0");
  if (declared > maxBytes) {
    return {
      ok: false,
      response: jsonError(413, `The request body is larger than ${maxBytes / 1024} KB.`),
    };
  }
  const text = await req.text();
  if (Buffer.byteLength(text) > maxBytes) {
    return {
      ok: false,
      response: jsonError(413, `The request body is larger than ${maxBytes / 1024} KB.`),
    };
  }
  let body: unknown;
  try {
    body = JSON.parse(text);
  } catch {
    return { ok: false, response: jsonError(400, "The request body is not valid JSON.") };
  }
  const parsed = schema.safeParse(body);
  if (!parsed.success) {
    return { ok: false, response: jsonError(422, "Some values are not valid.", zodIssues(parsed.error)) };
  }
  return { ok: true, data: parsed.data };
}

type Authed = { ok: true; user: SessionUser } | { ok: false; response: NextResponse };

export async function authenticate(roles?: Role[]): Promise<Authed> {
  const user = await getSessionUser();
  if (!user) return { ok: false, response: unauthorized() };
  if (roles && !roles.includes(user.role)) return { ok: false, response: forbidden() };
  return { ok: true, user };
}

type Handler<C> = (req: Request, ctx: C) => Promise<Response>;

export function handle<C>(name: string, fn: Handler<C>): Handler<C> {
  return async (req, ctx) => {
    try {
      return await fn(req, ctx);
    } catch (err) {
      console.error(`[api] ${name} failed:`, err);
      return jsonError(500, "The server hit an unexpected error. Try again in a moment.");
    }
  };
}
