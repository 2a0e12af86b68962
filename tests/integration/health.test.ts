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
