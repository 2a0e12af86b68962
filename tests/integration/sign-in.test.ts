import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import { hashPassword } from "@/lib/auth/password";
import { testEnv } from "../helpers/env";
import { ApiClient } from "../helpers/session";

const db = createDb(testEnv.databaseUrl, 2);
const PASSWORD = "a-long-enough-password";
let email = "";

beforeAll(async () => {
  email = `throttle-${randomUUID()}@example.test`;
  await db
    .insertInto("appUser")
    .values({
      email,
      name: "Throttle Test",
      role: "rep",
      regionId: null,
      passwordHash: await hashPassword(PASSWORD),
      status: "active",
    })
    .execute();
});

afterAll(async () => {
  await db.deleteFrom("signInAttempt").where("email", "=", email).execute();
  await db.deleteFrom("appUser").where("email", "=", email).execute();
  await db.destroy();
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

describe("repeated failed sign-ins", () => {
  it("are refused for a while after five failures, even with the right password", async () => {
    for (let i = 0; i < 5; i++) {
      expect(await new ApiClient().signIn(email, `wrong-password-${i}`)).toBe("WrongCredentials");
    }
    expect(await new ApiClient().signIn(email, PASSWORD)).toBe("TooManyAttempts");
    const failures = await db
      .selectFrom("signInAttempt")
      .select((eb) => eb.fn.countAll<string>().as("n"))
      .where("email", "=", email)
      .where("succeeded", "=", false)
      .executeTakeFirstOrThrow();
    expect(Number(failures.n)).toBe(5);
  });
});
