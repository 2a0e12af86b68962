import { createHash, randomUUID } from "node:crypto";
import { sql } from "kysely";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { UserStatus } from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import { testEnv } from "../helpers/env";
import { clearMailbox, linkIn, listMail, mailTo, waitForMail } from "../helpers/mailbox";
import { ApiClient } from "../helpers/session";

// The JSON the routes answer with.
interface ApiBody {
  error?: string;
  code?: string;
  message?: string;
  email?: string;
  issues?: { path: string; message: string }[];
}

const db = createDb(testEnv.databaseUrl, 2);
const emails: string[] = [];
const OLD_PASSWORD = "the first long password";
const NEW_PASSWORD = "a brand new long password";
let oldHash: string | undefined;

const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

// A sign-in of our own: the demo users' passwords must stay as they are.
async function createUser(status: UserStatus = "active") {
  const email = `reset-${randomUUID()}@example.test`;
  emails.push(email);
  oldHash ??= await hashPassword(OLD_PASSWORD);
  const row = await db
    .insertInto("appUser")
    .values({
      email,
      name: "Rhea Lindqvist",
      role: "rep",
      passwordHash: status === "invited" ? null : oldHash,
      status,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  return { id: row.id, email };
}

async function requestReset(email: string) {
  const res = await new ApiClient().json("/api/password-resets", "POST", { email });
  return { res, body: (await res.json()) as ApiBody };
}

async function complete(token: string, password: string) {
  const res = await new ApiClient().json("/api/password-resets/complete", "POST", { token, password });
  return { res, body: (await res.json()) as ApiBody };
}

const passwordHashOf = async (id: string) =>
  (await db.selectFrom("appUser").select("passwordHash").where("id", "=", id).executeTakeFirstOrThrow())
    .passwordHash;

const resetTokens = (userId: string) =>
  db
    .selectFrom("oneTimeToken")
    .selectAll()
    .where("userId", "=", userId)
    .where("purpose", "=", "password_reset")
    .execute();

afterAll(async () => {
  if (emails.length) {
    await db.deleteFrom("appUser").where("email", "in", emails).execute();
    await db.deleteFrom("signInAttempt").where("email", "in", emails).execute();
  }
  await db.destroy();
});

beforeEach(async () => {
  await clearMailbox();
});

describe("password reset", () => {
  it("e-mails one link for a known address; the link sets a new password once", async () => {
    const user = await createUser();
    const { res, body } = await requestReset(user.email);
    expect(res.status).toBe(202);
    expect(body.message).toMatch(/If that address has a Trenchbook sign-in/);

    const [mail] = await waitForMail(user.email);
    expect(mail!.subject).toBe("Reset your Trenchbook password");
    expect(mail!.text).toContain("Hello Rhea Lindqvist,");
    const { url, token } = linkIn(mail!, "reset-password");
    expect(mail!.html).toContain(`href="${url}"`);
    const tokens = await resetTokens(user.id);
    expect(tokens).toHaveLength(1);
    expect(tokens[0]!.tokenHash).toBe(sha256(token));
    const minutesLeft = (tokens[0]!.expiresAt.getTime() - Date.now()) / 60_000;
    expect(minutesLeft).toBeGreaterThan(58);
    expect(minutesLeft).toBeLessThanOrEqual(60);

    const shown = await new ApiClient().fetch(`/reset-password/${token}`);
    expect(shown.status).toBe(200);
    expect(await shown.text()).toContain(`Choose a new password for ${user.email}.`);

    const done = await complete(token, NEW_PASSWORD);
    expect(done.res.status).toBe(200);
    expect(done.body.email).toBe(user.email);

    expect(await new ApiClient().signIn(user.email, OLD_PASSWORD)).toBe("WrongCredentials");
    const client = new ApiClient();
    expect(await client.signIn(user.email, NEW_PASSWORD)).toBeNull();
    expect((await (await client.fetch("/api/auth/session")).json()).user.role).toBe("rep");

    const reused = await complete(token, "yet another long password");
    expect(reused.res.status).toBe(410);
    expect(reused.body.code).toBe("used");
    expect(reused.body.error).toMatch(/already been used/);
    expect(await new ApiClient().signIn(user.email, NEW_PASSWORD)).toBeNull();

    // Only the one e-mail was sent.
    expect(await mailTo(user.email)).toHaveLength(1);
  });

  it("answers unknown, invited and deactivated addresses exactly like a known one, and mails none of them", async () => {
    const invited = await createUser("invited");
    const deactivated = await createUser("deactivated");
    const known = await createUser();
    const unknown = `nobody-${randomUUID()}@example.test`;

    const answers = [];
    for (const email of [unknown, invited.email, deactivated.email, known.email]) {
      const { res, body } = await requestReset(email);
      answers.push({ status: res.status, body });
    }
    for (const a of answers) expect(a).toEqual(answers[3]);
    expect(answers[3]!.status).toBe(202);

    // Nothing is queued for the others: once the known address's e-mail is in, it is the only one.
    await waitForMail(known.email);
    const all = await listMail();
    expect(all.map((m) => m.to[0]!.address)).toEqual([known.email]);
    expect(await resetTokens(invited.id)).toHaveLength(0);
    expect(await resetTokens(deactivated.id)).toHaveLength(0);
  });

  it("refuses an expired link with a clear message and keeps the old password", async () => {
    const user = await createUser();
    await requestReset(user.email);
    const { token } = linkIn((await waitForMail(user.email))[0]!, "reset-password");
    await db
      .updateTable("oneTimeToken")
      .set({ expiresAt: sql<Date>`now() - interval '1 second'` })
      .where("tokenHash", "=", sha256(token))
      .execute();

    const before = await passwordHashOf(user.id);
    const { res, body } = await complete(token, NEW_PASSWORD);
    expect(res.status).toBe(410);
    expect(body.code).toBe("expired");
    expect(body.error).toMatch(/expired/);
    expect(await passwordHashOf(user.id)).toBe(before);
    expect(await (await new ApiClient().fetch(`/reset-password/${token}`)).text()).toContain(
      "This link has expired.",
    );
  });

  it("retires the older link when a new one is asked for", async () => {
    const user = await createUser();
    await requestReset(user.email);
    const first = linkIn((await waitForMail(user.email, 1))[0]!, "reset-password");
    await requestReset(user.email);
    const second = linkIn((await waitForMail(user.email, 2))[1]!, "reset-password");
    expect(second.token).not.toBe(first.token);

    expect((await complete(first.token, NEW_PASSWORD)).body.code).toBe("expired");
    expect((await complete(second.token, NEW_PASSWORD)).res.status).toBe(200);
    expect(await new ApiClient().signIn(user.email, NEW_PASSWORD)).toBeNull();
  });

  it("clears earlier failed sign-ins of the address", async () => {
    const user = await createUser();
    await db
      .insertInto("signInAttempt")
      .values(Array.from({ length: 5 }, () => ({ email: user.email, succeeded: false })))
      .execute();
    expect(await new ApiClient().signIn(user.email, OLD_PASSWORD)).toBe("TooManyAttempts");

    await requestReset(user.email);
    const { token } = linkIn((await waitForMail(user.email))[0]!, "reset-password");
    expect((await complete(token, NEW_PASSWORD)).res.status).toBe(200);
    expect(await new ApiClient().signIn(user.email, NEW_PASSWORD)).toBeNull();
  });
});

describe("password reset: bad input", () => {
  it("answers 422, 413 and 415 with clear messages and sends nothing", async () => {
    const malformed = await requestReset("not-an-address");
    expect(malformed.res.status).toBe(422);
    expect(malformed.body.issues?.[0]).toMatchObject({ path: "email" });
    expect(malformed.body.issues?.[0]?.message).toMatch(/valid e-mail/);

    const oversized = await new ApiClient().json("/api/password-resets", "POST", {
      email: "x@example.test",
      padding: "x".repeat(70 * 1024),
    });
    expect(oversized.status).toBe(413);

    const notJson = await new ApiClient().fetch("/api/password-resets", {
      method: "POST",
      headers: { "content-type": "text/plain" },
      body: "x@example.test",
    });
    expect(notJson.status).toBe(415);

    const user = await createUser();
    await requestReset(user.email);
    const { token } = linkIn((await waitForMail(user.email))[0]!, "reset-password");
    const before = await passwordHashOf(user.id);

    const short = await complete(token, "short");
    expect(short.res.status).toBe(422);
    expect(short.body.issues).toEqual([{ path: "password", message: "Use at least 10 characters." }]);

    const unknown = await complete(Buffer.alloc(32, 9).toString("base64url"), NEW_PASSWORD);
    expect(unknown.res.status).toBe(404);
    expect(unknown.body.code).toBe("invalid");

    expect(await passwordHashOf(user.id)).toBe(before);
    expect((await resetTokens(user.id))[0]!.usedAt).toBeNull();
    expect(await listMail()).toHaveLength(1);
  });
});
