import { createHash, randomUUID } from "node:crypto";
import { sql } from "kysely";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import { testEnv } from "../helpers/env";
import { clearMailbox, linkIn, listMail, waitForMail } from "../helpers/mailbox";
import { ApiClient, signedInAs } from "../helpers/session";

// The JSON the routes answer with.
interface ApiBody {
  error?: string;
  code?: string;
  message?: string;
  email?: string;
  issues?: { path: string; message: string }[];
  invitation?: { email: string; name: string; role: string; regionId: string | null; reinvited: boolean };
}

const db = createDb(testEnv.databaseUrl, 2);
const suffix = randomUUID().slice(0, 8);
const emails: string[] = [];
const fx = {
  regionId: "",
  regionName: `Invite test region ${suffix}`,
  accountId: "",
  otherAccountId: "",
  otherRegionId: "",
};
let admin: ApiClient;

function newEmail(label = "invitee") {
  const email = `${label}-${randomUUID()}@example.test`;
  emails.push(email);
  return email;
}

const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

function findUser(email: string) {
  return db.selectFrom("appUser").selectAll().where("email", "=", email.toLowerCase()).executeTakeFirst();
}

async function invite(body: Record<string, unknown>, client = admin) {
  const res = await client.json("/api/invitations", "POST", body);
  return { res, body: (await res.json()) as ApiBody };
}

async function accept(token: string, password: string) {
  const res = await new ApiClient().json("/api/invitations/accept", "POST", { token, password });
  return { res, body: (await res.json()) as ApiBody };
}

async function page(path: string) {
  const res = await new ApiClient().fetch(path);
  return { status: res.status, html: await res.text() };
}

beforeAll(async () => {
  admin = await signedInAs("admin");
  const region = await db
    .insertInto("region")
    .values({ name: fx.regionName })
    .returning("id")
    .executeTakeFirstOrThrow();
  const other = await db
    .insertInto("region")
    .values({ name: `Invite test other region ${suffix}` })
    .returning("id")
    .executeTakeFirstOrThrow();
  fx.regionId = region.id;
  fx.otherRegionId = other.id;
  fx.accountId = (
    await db
      .insertInto("account")
      .values({ regionId: region.id, name: `Invite Test Farm ${suffix}`, locality: "Test bench" })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  fx.otherAccountId = (
    await db
      .insertInto("account")
      .values({ regionId: other.id, name: `Invite Other Farm ${suffix}`, locality: null })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
});

afterAll(async () => {
  if (emails.length) {
    await db.deleteFrom("appUser").where("email", "in", emails).execute();
    await db.deleteFrom("signInAttempt").where("email", "in", emails).execute();
  }
  await db.deleteFrom("account").where("id", "in", [fx.accountId, fx.otherAccountId]).execute();
  await db.deleteFrom("region").where("id", "in", [fx.regionId, fx.otherRegionId]).execute();
  await db.destroy();
});

beforeEach(async () => {
  await clearMailbox();
});

describe("inviting a user", () => {
  it("e-mails a link that sets the password; the new rep signs in with the role and accounts given", async () => {
    const email = newEmail();
    const { res, body } = await invite({
      email,
      name: "Ines Calloway",
      role: "rep",
      regionId: fx.regionId,
      accountIds: [fx.accountId],
    });
    expect(res.status).toBe(201);
    expect(body.invitation).toMatchObject({
      email,
      name: "Ines Calloway",
      role: "rep",
      regionId: fx.regionId,
    });
    expect(body.invitation?.reinvited).toBe(false);

    const user = await findUser(email);
    expect(user).toMatchObject({ status: "invited", passwordHash: null, role: "rep", regionId: fx.regionId });
    const served = await db.selectFrom("accountRep").selectAll().where("userId", "=", user!.id).execute();
    expect(served.map((r) => r.accountId)).toEqual([fx.accountId]);

    const [mail] = await waitForMail(email);
    expect(mail!.subject).toContain("Trenchbook");
    expect(mail!.text).toContain("Hello Ines Calloway,");
    expect(mail!.text).toContain("Priya Anand has invited you");
    const { url, token } = linkIn(mail!, "invite");
    expect(url.startsWith(`${testEnv.appUrl}/invite/`)).toBe(true);
    expect(Buffer.from(token, "base64url")).toHaveLength(32);
    expect(mail!.html).toContain(`href="${url}"`);
    // The response never carries the token; the database keeps only its hash.
    expect(JSON.stringify(body)).not.toContain(token);
    const tokens = await db.selectFrom("oneTimeToken").selectAll().where("userId", "=", user!.id).execute();
    expect(tokens).toHaveLength(1);
    expect(tokens[0]).toMatchObject({ purpose: "invite", tokenHash: sha256(token), usedAt: null });
    const hoursLeft = (tokens[0]!.expiresAt.getTime() - Date.now()) / 3_600_000;
    expect(hoursLeft).toBeGreaterThan(71);
    expect(hoursLeft).toBeLessThanOrEqual(72);

    const shown = await page(`/invite/${token}`);
    expect(shown.status).toBe(200);
    expect(shown.html).toContain(`Welcome to Trenchbook, Ines Calloway.`);
    expect(shown.html).toContain(email);

    const accepted = await accept(token, "a furrow full of water");
    expect(accepted.res.status).toBe(200);
    expect(accepted.body.email).toBe(email);
    const active = await findUser(email);
    expect(active!.status).toBe("active");
    expect(active!.passwordHash).toMatch(/^\$2[aby]\$12\$/);

    const client = new ApiClient();
    expect(await client.signIn(email, "a furrow full of water")).toBeNull();
    const session = await (await client.fetch("/api/auth/session")).json();
    expect(session.user.role).toBe("rep");
    const accounts = (await (await client.fetch("/api/accounts")).json()).accounts as { id: string }[];
    expect(accounts.map((a) => a.id)).toEqual([fx.accountId]);

    const reused = await accept(token, "another long password");
    expect(reused.res.status).toBe(410);
    expect(reused.body.code).toBe("used");
    expect(reused.body.error).toMatch(/already been used/);
    expect((await page(`/invite/${token}`)).html).toContain("This link has already been used.");
    // The second attempt did not change the password.
    expect((await findUser(email))!.passwordHash).toBe(active!.passwordHash);
  });

  it("gives a grower their farm and a supervisor and an admin their roles", async () => {
    const cases = [
      { role: "grower", regionId: fx.regionId, accountIds: [fx.accountId] },
      { role: "supervisor", regionId: fx.regionId },
      { role: "admin", regionId: null },
    ];
    for (const c of cases) {
      const email = newEmail(c.role);
      const { res } = await invite({ email, name: `Test ${c.role}`, ...c });
      expect(res.status).toBe(201);
      const { token } = linkIn((await waitForMail(email))[0]!, "invite");
      expect((await accept(token, "rows of emerging corn")).res.status).toBe(200);
      const client = new ApiClient();
      expect(await client.signIn(email, "rows of emerging corn")).toBeNull();
      const session = await (await client.fetch("/api/auth/session")).json();
      expect(session.user.role).toBe(c.role);
      const user = await findUser(email);
      expect(user!.regionId).toBe(c.regionId);
      if (c.role === "grower") {
        const own = await db
          .selectFrom("accountGrower")
          .select("accountId")
          .where("userId", "=", user!.id)
          .execute();
        expect(own.map((r) => r.accountId)).toEqual([fx.accountId]);
      }
    }
  });

  it("refuses an expired link with a clear message and leaves the invitation unanswered", async () => {
    const email = newEmail();
    expect(
      (await invite({ email, name: "Odile Banks", role: "supervisor", regionId: fx.regionId })).res.status,
    ).toBe(201);
    const { token } = linkIn((await waitForMail(email))[0]!, "invite");
    await db
      .updateTable("oneTimeToken")
      .set({ expiresAt: sql<Date>`now() - interval '1 minute'` })
      .where("tokenHash", "=", sha256(token))
      .execute();

    const { res, body } = await accept(token, "a furrow full of water");
    expect(res.status).toBe(410);
    expect(body.code).toBe("expired");
    expect(body.error).toMatch(/expired/);
    expect((await page(`/invite/${token}`)).html).toContain("This link has expired.");
    expect(await findUser(email)).toMatchObject({ status: "invited", passwordHash: null });
  });

  it("lets exactly one of two simultaneous uses of a link succeed", async () => {
    const email = newEmail();
    await invite({ email, name: "Race Tester", role: "supervisor", regionId: fx.regionId });
    const { token } = linkIn((await waitForMail(email))[0]!, "invite");
    const results = await Promise.all([
      accept(token, "first of two passwords"),
      accept(token, "second of two passwords"),
    ]);
    expect(results.map((r) => r.res.status).sort()).toEqual([200, 410]);
    const winner = results.find((r) => r.res.status === 200) === results[0] ? "first" : "second";
    expect(await new ApiClient().signIn(email, `${winner} of two passwords`)).toBeNull();
  });

  it("re-sends to an unanswered invitation with a new link that replaces the old one, and refuses an active address", async () => {
    const email = newEmail();
    expect((await invite({ email, name: "First Name", role: "rep", regionId: fx.regionId })).res.status).toBe(
      201,
    );
    const first = linkIn((await waitForMail(email, 1))[0]!, "invite");

    const again = await invite({
      email: email.toUpperCase(),
      name: "Second Name",
      role: "grower",
      regionId: fx.regionId,
      accountIds: [fx.accountId],
    });
    expect(again.res.status).toBe(200);
    expect(again.body.invitation?.reinvited).toBe(true);
    const mails = await waitForMail(email, 2);
    const second = linkIn(mails[1]!, "invite");
    expect(second.token).not.toBe(first.token);
    const users = await db
      .selectFrom("appUser")
      .selectAll()
      .where(sql<boolean>`lower(email) = ${email.toLowerCase()}`)
      .execute();
    expect(users).toHaveLength(1);
    expect(users[0]).toMatchObject({ name: "Second Name", role: "grower", status: "invited" });

    expect((await accept(first.token, "a furrow full of water")).body.code).toBe("expired");
    expect((await accept(second.token, "a furrow full of water")).res.status).toBe(200);

    const duplicate = await invite({ email, name: "Third Name", role: "rep", regionId: fx.regionId });
    expect(duplicate.res.status).toBe(409);
    expect(duplicate.body.error).toMatch(/already has an active sign-in/);
    expect((await findUser(email))!.name).toBe("Second Name");
  });

  it("answers 409 for an address of an existing demo user and leaves that user alone", async () => {
    const { res, body } = await invite({ email: "Marisol@Trenchbook.test", name: "Imposter", role: "admin" });
    expect(res.status).toBe(409);
    expect(body.error).toMatch(/already has an active sign-in/);
    const marisol = await findUser("marisol@trenchbook.test");
    expect(marisol).toMatchObject({ name: "Marisol Quintero", role: "rep", status: "active" });
  });
});

describe("who may invite", () => {
  it("refuses reps, growers and supervisors with 403 JSON and creates nothing", async () => {
    for (const key of ["rep1", "grower1", "supervisor"]) {
      const email = newEmail(key);
      const client = await signedInAs(key);
      const { res, body } = await invite(
        { email, name: "Nobody", role: "rep", regionId: fx.regionId },
        client,
      );
      expect(res.status).toBe(403);
      expect(res.headers.get("content-type")).toContain("application/json");
      expect(body.error).toMatch(/permission/);
      expect(await findUser(email)).toBeUndefined();
    }
    expect(await listMail()).toHaveLength(0);
  });

  it("answers 401 JSON, not a redirect, without a session", async () => {
    const email = newEmail();
    const res = await new ApiClient().json("/api/invitations", "POST", {
      email,
      name: "Nobody",
      role: "admin",
    });
    expect(res.status).toBe(401);
    expect(res.headers.get("location")).toBeNull();
    expect(res.headers.get("content-type")).toContain("application/json");
    expect((await res.json()).error).toMatch(/sign in/i);
    expect(await findUser(email)).toBeUndefined();
  });

  it("shows the invite page only to admins", async () => {
    const asAdmin = await admin.fetch("/admin/users/invite");
    expect(asAdmin.status).toBe(200);
    const html = await asAdmin.text();
    expect(html).toContain("Invite a user");
    expect(html).toContain(fx.regionName);
    const rep = await signedInAs("rep1");
    expect((await rep.fetch("/admin/users/invite")).status).toBe(404);
  });
});

describe("bad input", () => {
  const issuePaths = (body: ApiBody) => (body.issues as { path: string }[]).map((i) => i.path);

  it("answers 4xx with the issues and writes nothing", async () => {
    const base = () => ({ email: newEmail("bad"), name: "Bad Input", role: "rep", regionId: fx.regionId });

    const malformed = await invite({ ...base(), email: "not-an-address" });
    expect(malformed.res.status).toBe(422);
    expect(issuePaths(malformed.body)).toContain("email");
    expect(malformed.body.issues?.[0]?.message).toMatch(/valid e-mail/);

    const cases: { body: Record<string, unknown>; path: string }[] = [
      { body: { ...base(), role: "owner" }, path: "role" },
      { body: { ...base(), regionId: null }, path: "regionId" },
      { body: { ...base(), regionId: "not-a-uuid" }, path: "regionId" },
      { body: { ...base(), name: "   " }, path: "name" },
      { body: { ...base(), role: "supervisor", accountIds: [fx.accountId] }, path: "accountIds" },
      { body: { ...base(), accountIds: ["nope"] }, path: "accountIds.0" },
    ];
    for (const c of cases) {
      const { res, body } = await invite(c.body);
      expect(res.status, JSON.stringify(c.body)).toBe(422);
      expect(body.error).toBe("Some values are not valid.");
      expect(issuePaths(body)).toContain(c.path);
      expect(await findUser(String(c.body.email))).toBeUndefined();
    }

    const wrongRegionAccount = { ...base(), accountIds: [fx.otherAccountId] };
    const foreign = await invite(wrongRegionAccount);
    expect(foreign.res.status).toBe(422);
    expect(foreign.body.error).toMatch(/not in the chosen region/);
    expect(await findUser(wrongRegionAccount.email)).toBeUndefined();

    const noRegion = { ...base(), regionId: randomUUID() };
    expect((await invite(noRegion)).res.status).toBe(422);
    expect(await findUser(noRegion.email)).toBeUndefined();

    const big = { ...base(), name: "x".repeat(70 * 1024) };
    const oversized = await invite(big);
    expect(oversized.res.status).toBe(413);
    expect(oversized.body.error).toMatch(/larger than 64 KB/);
    expect(await findUser(big.email)).toBeUndefined();

    const plain = base();
    const notJson = await admin.fetch("/api/invitations", {
      method: "POST",
      headers: { "content-type": "text/plain" },
      body: JSON.stringify(plain),
    });
    expect(notJson.status).toBe(415);
    expect((await notJson.json()).error).toMatch(/application\/json/);
    expect(await findUser(plain.email)).toBeUndefined();

    const broken = await admin.fetch("/api/invitations", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: "{ not json",
    });
    expect(broken.status).toBe(400);

    expect(await listMail()).toHaveLength(0);
  });

  it("refuses a short password, a malformed or unknown token and a non-JSON accept", async () => {
    const email = newEmail();
    await invite({ email, name: "Short Password", role: "supervisor", regionId: fx.regionId });
    const { token } = linkIn((await waitForMail(email))[0]!, "invite");

    const short = await accept(token, "short");
    expect(short.res.status).toBe(422);
    expect(short.body.issues).toEqual([{ path: "password", message: "Use at least 10 characters." }]);
    expect(await findUser(email)).toMatchObject({ status: "invited", passwordHash: null });

    const malformed = await accept("not a token!", "a furrow full of water");
    expect(malformed.res.status).toBe(422);
    expect(malformed.body.issues?.[0]?.path).toBe("token");

    const unknown = await accept(Buffer.alloc(32, 7).toString("base64url"), "a furrow full of water");
    expect(unknown.res.status).toBe(404);
    expect(unknown.body.code).toBe("invalid");
    expect(unknown.body.error).toMatch(/not valid/);

    const notJson = await new ApiClient().fetch("/api/invitations/accept", {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ token, password: "a furrow full of water" }),
    });
    expect(notJson.status).toBe(415);
    expect(await findUser(email)).toMatchObject({ status: "invited", passwordHash: null });

    const garbagePage = await page("/invite/not-a-token");
    expect(garbagePage.status).toBe(200);
    expect(garbagePage.html).toContain("This link is not valid.");

    // The link still works after all that.
    expect((await accept(token, "a furrow full of water")).res.status).toBe(200);
  });
});
