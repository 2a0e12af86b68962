import { describe, expect, it } from "vitest";
import { ApiClient } from "../helpers/session";

describe("GET /api/health", () => {
  it("reports the database, object store and mail server up", async () => {
    const res = await new ApiClient().fetch("/api/health");
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.status).toBe("ok");
    expect(body.services.database.up).toBe(true);
    expect(body.services.objectStore.up).toBe(true);
    expect(body.services.mail.up).toBe(true);
  });
});

describe("sign-in", () => {
  it("signs a demo rep in and exposes the role in the session", async () => {
    const client = new ApiClient();
    expect(await client.signIn("marisol@trenchbook.test", "trench-demo-2026")).toBeNull();
    const session = await (await client.fetch("/api/auth/session")).json();
    expect(session.user.role).toBe("rep");
  });

  it("refuses a wrong password with a clear code", async () => {
    expect(await new ApiClient().signIn("dale@trenchbook.test", "not-the-password")).toBe("WrongCredentials");
  });
});
