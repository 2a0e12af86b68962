// Signs in through the real next-auth credentials flow and keeps the session cookie, so integration
// tests exercise the real route handlers exactly as a browser does.
import { DEMO_PASSWORD, DEMO_USERS } from "@/db/seed/demo-users";
import { testEnv } from "./env";

export class ApiClient {
  private cookies = new Map<string, string>();

  constructor(readonly baseUrl = testEnv.appUrl) {}

  private cookieHeader() {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
  }

  private keepCookies(res: Response) {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(";");
      const i = pair!.indexOf("=");
      this.cookies.set(pair!.slice(0, i), pair!.slice(i + 1));
    }
  }

  async fetch(path: string, init: RequestInit = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    if (this.cookies.size) headers.set("cookie", this.cookieHeader());
    const res = await fetch(`${this.baseUrl}${path}`, { ...init, headers, redirect: "manual" });
    this.keepCookies(res);
    return res;
  }

  json(path: string, method: string, body: unknown): Promise<Response> {
    return this.fetch(path, {
      method,
      headers: { "content-type": "application/json" },
      body: JSON.stringify(body),
    });
  }

  // Returns the next-auth error code on failure, or null when signed in.
  async signIn(email: string, password: string): Promise<string | null> {
    const csrf = (await (await this.fetch("/api/auth/csrf")).json()) as { csrfToken: string };
    const res = await this.fetch("/api/auth/callback/credentials", {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ csrfToken: csrf.csrfToken, email, password, json: "true" }),
    });
    // next-auth answers a JSON body { url } to json=true, a redirect otherwise; either carries ?error=.
    const location =
      res.headers.get("location") ?? ((await res.json().catch(() => ({}))) as { url?: string }).url ?? "";
    const error = new URL(location, this.baseUrl).searchParams.get("error");
    if (error) return error;
    const session = (await (await this.fetch("/api/auth/session")).json()) as { user?: { id: string } };
    return session.user ? null : "NoSession";
  }
}

export async function signedInAs(key: string): Promise<ApiClient> {
  const user = DEMO_USERS.find((u) => u.key === key);
  if (!user) throw new Error(`No demo user ${key}`);
  const client = new ApiClient();
  const error = await client.signIn(user.email, DEMO_PASSWORD);
  if (error) throw new Error(`Sign-in as ${key} failed: ${error}`);
  return client;
}
