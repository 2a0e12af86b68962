// The admin API behind the Users and Regions screens: listing and filtering users, changing a user's
// role, region and status (and what that does to their sign-in), the refusals, and creating regions.
// Fixture users, a fixture account and fixture regions are created here and removed afterwards.
import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database, Role } from "@/db/schema";
import { DEMO_USERS } from "@/db/seed/demo-users";
import { hashPassword } from "@/lib/auth/password";
import { testEnv } from "../helpers/env";
import { ApiClient, signedInAs } from "../helpers/session";

const tag = randomUUID().slice(0, 8);
const FIXTURE_PASSWORD = "fixture-password-2026";
let db: Kysely<Database>;
let admin: ApiClient;
let sandhollow: string;
let upperMesa: string;
let adminId: string;
let fixtureHash: string;

interface ListedUser {
  id: string;
  name: string;
  email: string;
  role: Role;
  regionId: string | null;
  regionName: string | null;
  status: string;
}

let counter = 0;
async function fixtureUser(opts: {
  name: string;
  role: Role;
  regionId: string | null;
  status?: "active" | "invited";
}) {
  const email = `admin-fx-${++counter}-${tag}@trenchbook.test`;
  const row = await db
    .insertInto("appUser")
    .values({
      email,
      name: `${opts.name} ${tag}`,
      role: opts.role,
      regionId: opts.regionId,
      passwordHash: opts.status === "invited" ? null : fixtureHash,
      status: opts.status ?? "active",
    })
    .returning(["id", "email", "name"])
    .executeTakeFirstOrThrow();
  return row;
}

const userRow = (id: string) =>
  db
    .selectFrom("appUser")
    .select(["role", "regionId", "status"])
    .where("id", "=", id)
    .executeTakeFirstOrThrow();

async function listUsers(client: ApiClient, query: string): Promise<ListedUser[]> {
  const res = await client.fetch(`/api/users?${query}`);
  expect(res.status).toBe(200);
  return ((await res.json()) as { users: ListedUser[] }).users;
}

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  fixtureHash = await hashPassword(FIXTURE_PASSWORD);
  const regions = await db.selectFrom("region").select(["id", "name"]).execute();
  sandhollow = regions.find((r) => r.name === "Sandhollow Valley")!.id;
  upperMesa = regions.find((r) => r.name === "Upper Mesa")!.id;
  const adminEmail = DEMO_USERS.find((u) => u.key === "admin")!.email;
  adminId = (
    await db.selectFrom("appUser").select("id").where("email", "=", adminEmail).executeTakeFirstOrThrow()
  ).id;
  admin = await signedInAs("admin");
});

afterAll(async () => {
  const emails = db
    .selectFrom("appUser")
    .select("email")
    .where("email", "like", `admin-fx-%-${tag}@trenchbook.test`);
  await db.deleteFrom("signInAttempt").where("email", "in", emails).execute();
  await db.deleteFrom("account").where("name", "like", `Admin Fixture Farm ${tag}%`).execute();
  await db.deleteFrom("appUser").where("email", "like", `admin-fx-%-${tag}@trenchbook.test`).execute();
  await db.deleteFrom("region").where("name", "ilike", `Admin Fixture Region ${tag}%`).execute();
  await db.destroy();
});

describe("GET /api/users", () => {
  it("lets an admin search by name or e-mail (case-insensitive) and filter by role, region and status", async () => {
    const grower = await fixtureUser({ name: "Ysolde Brightwater", role: "grower", regionId: sandhollow });
    const rep = await fixtureUser({ name: "Ysolde Fairbanks", role: "rep", regionId: upperMesa });
    const invited = await fixtureUser({
      name: "Casimir Fairbanks",
      role: "rep",
      regionId: null,
      status: "invited",
    });

    const byTag = await listUsers(admin, `q=${tag.toUpperCase()}`);
    expect(byTag.map((u) => u.id).sort()).toEqual([grower.id, rep.id, invited.id].sort());

    const byName = await listUsers(admin, `q=${encodeURIComponent(`ysolde fairbanks ${tag}`)}`);
    expect(byName.map((u) => u.id)).toEqual([rep.id]);
    expect(byName[0]).toMatchObject({
      name: rep.name,
      email: rep.email,
      role: "rep",
      regionName: "Upper Mesa",
    });

    const byEmail = await listUsers(admin, `q=${encodeURIComponent(invited.email.toUpperCase())}`);
    expect(byEmail.map((u) => u.id)).toEqual([invited.id]);

    expect((await listUsers(admin, `q=${tag}&role=grower`)).map((u) => u.id)).toEqual([grower.id]);
    expect((await listUsers(admin, `q=${tag}&regionId=${upperMesa}`)).map((u) => u.id)).toEqual([rep.id]);
    expect((await listUsers(admin, `q=${tag}&regionId=none`)).map((u) => u.id)).toEqual([invited.id]);
    expect((await listUsers(admin, `q=${tag}&status=invited`)).map((u) => u.id)).toEqual([invited.id]);
    expect((await listUsers(admin, `q=${tag}&role=rep&status=active`)).map((u) => u.id)).toEqual([rep.id]);

    // A "%" in a search is a character, not a wildcard.
    expect(await listUsers(admin, `q=${encodeURIComponent(`%${tag}`)}`)).toEqual([]);
  });

  it("answers 422 with the issues for an unknown role filter", async () => {
    const res = await admin.fetch("/api/users?role=wizard");
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.issues.map((i: { path: string }) => i.path)).toContain("role");
  });

  it("shows a supervisor only the users of their own region", async () => {
    const own = await fixtureUser({ name: "Oswin Sandhollow", role: "rep", regionId: sandhollow });
    const other = await fixtureUser({ name: "Oswin Mesa", role: "rep", regionId: upperMesa });
    const supervisor = await signedInAs("supervisor");

    const seen = await listUsers(supervisor, `q=${encodeURIComponent(`Oswin`)}`);
    expect(seen.map((u) => u.id)).toContain(own.id);
    expect(seen.map((u) => u.id)).not.toContain(other.id);
    // Asking for another region does not widen the view.
    const asked = await listUsers(supervisor, `regionId=${upperMesa}`);
    expect(asked.map((u) => u.id)).not.toContain(other.id);
    expect(asked.length).toBeGreaterThan(0);
    for (const u of [...seen, ...asked]) {
      expect(u.regionId).toBe(sandhollow);
      expect(u).not.toHaveProperty("repAccounts");
    }

    const all = await listUsers(admin, `q=Oswin`);
    expect(all.map((u) => u.id)).toEqual(expect.arrayContaining([own.id, other.id]));
  });

  it("refuses reps and growers with 403 JSON, and a signed-out caller with 401", async () => {
    for (const key of ["rep1", "grower1"]) {
      const res = await (await signedInAs(key)).fetch("/api/users");
      expect(res.status).toBe(403);
      expect(res.headers.get("content-type")).toContain("application/json");
      expect((await res.json()).error).toEqual(expect.any(String));
    }
    expect((await new ApiClient().fetch("/api/users")).status).toBe(401);
  });
});

describe("PATCH /api/users/[id]", () => {
  it("changes a user's role and region in PostgreSQL", async () => {
    const user = await fixtureUser({ name: "Theodora Lind", role: "grower", regionId: sandhollow });
    const res = await admin.json(`/api/users/${user.id}`, "PATCH", {
      role: "supervisor",
      regionId: upperMesa,
    });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.user).toMatchObject({
      id: user.id,
      role: "supervisor",
      regionId: upperMesa,
      regionName: "Upper Mesa",
    });
    expect(await userRow(user.id)).toEqual({ role: "supervisor", regionId: upperMesa, status: "active" });

    const cleared = await admin.json(`/api/users/${user.id}`, "PATCH", { regionId: null });
    expect(cleared.status).toBe(200);
    expect(await userRow(user.id)).toEqual({ role: "supervisor", regionId: null, status: "active" });
  });

  it("refuses an unknown role with 422 and the zod issues, and changes nothing", async () => {
    const user = await fixtureUser({ name: "Wendeline Marsh", role: "rep", regionId: sandhollow });
    const res = await admin.json(`/api/users/${user.id}`, "PATCH", { role: "overlord", regionId: upperMesa });
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.issues).toEqual(expect.arrayContaining([expect.objectContaining({ path: "role" })]));
    expect(await userRow(user.id)).toEqual({ role: "rep", regionId: sandhollow, status: "active" });

    // Unknown keys, an unknown region and an empty body are refused too.
    expect((await admin.json(`/api/users/${user.id}`, "PATCH", { rol: "grower" })).status).toBe(422);
    expect((await admin.json(`/api/users/${user.id}`, "PATCH", {})).status).toBe(422);
    const noRegion = await admin.json(`/api/users/${user.id}`, "PATCH", { regionId: randomUUID() });
    expect(noRegion.status).toBe(422);
    expect((await noRegion.json()).issues[0].path).toBe("regionId");
    expect(await userRow(user.id)).toEqual({ role: "rep", regionId: sandhollow, status: "active" });
  });

  it("refuses a body over the limit with 413", async () => {
    const user = await fixtureUser({ name: "Bartholomew Crane", role: "rep", regionId: sandhollow });
    const res = await admin.json(`/api/users/${user.id}`, "PATCH", {
      role: "grower",
      padding: "x".repeat(70_000),
    });
    expect(res.status).toBe(413);
    expect((await res.json()).error).toMatch(/larger than/);
    expect((await userRow(user.id)).role).toBe("rep");
  });

  it("deactivates a user: their session stops working and they cannot sign in again until reactivated", async () => {
    const user = await fixtureUser({ name: "Isadora Quill", role: "rep", regionId: sandhollow });
    const theirs = new ApiClient();
    expect(await theirs.signIn(user.email, FIXTURE_PASSWORD)).toBeNull();
    expect((await theirs.fetch("/api/accounts")).status).toBe(200);

    const res = await admin.json(`/api/users/${user.id}`, "PATCH", { status: "deactivated" });
    expect(res.status).toBe(200);
    expect((await userRow(user.id)).status).toBe("deactivated");

    const after = await theirs.fetch("/api/accounts");
    expect(after.status).toBe(401);
    expect(after.headers.get("content-type")).toContain("application/json");
    expect(await new ApiClient().signIn(user.email, FIXTURE_PASSWORD)).toBe("Deactivated");

    expect((await admin.json(`/api/users/${user.id}`, "PATCH", { status: "active" })).status).toBe(200);
    expect((await userRow(user.id)).status).toBe("active");
    expect(await new ApiClient().signIn(user.email, FIXTURE_PASSWORD)).toBeNull();
  });

  it("reactivating someone who never set a password puts them back to invited", async () => {
    const user = await fixtureUser({
      name: "Leopold Ashdown",
      role: "grower",
      regionId: null,
      status: "invited",
    });
    expect((await admin.json(`/api/users/${user.id}`, "PATCH", { status: "deactivated" })).status).toBe(200);
    const res = await admin.json(`/api/users/${user.id}`, "PATCH", { status: "active" });
    expect(res.status).toBe(200);
    expect((await res.json()).user.status).toBe("invited");
  });

  it("keeps an admin from deactivating themselves or removing their own admin role", async () => {
    const deactivate = await admin.json(`/api/users/${adminId}`, "PATCH", { status: "deactivated" });
    expect(deactivate.status).toBe(422);
    expect((await deactivate.json()).error).toMatch(/your own/);
    const demote = await admin.json(`/api/users/${adminId}`, "PATCH", { role: "rep" });
    expect(demote.status).toBe(422);
    expect((await demote.json()).error).toMatch(/your own admin role/);
    expect(await userRow(adminId)).toMatchObject({ role: "admin", status: "active" });
    expect((await admin.fetch("/api/users?role=admin")).status).toBe(200);
  });

  it("changing a rep's role removes no assignment and reports the accounts still assigned", async () => {
    const rep = await fixtureUser({ name: "Ambrose Kettle", role: "rep", regionId: sandhollow });
    const account = await db
      .insertInto("account")
      .values({ regionId: sandhollow, name: `Admin Fixture Farm ${tag}`, locality: "Test bench" })
      .returning("id")
      .executeTakeFirstOrThrow();
    await db.insertInto("accountRep").values({ accountId: account.id, userId: rep.id }).execute();

    const res = await admin.json(`/api/users/${rep.id}`, "PATCH", { role: "grower" });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.stillAssigned.rep).toEqual([{ id: account.id, name: `Admin Fixture Farm ${tag}` }]);
    const kept = await db.selectFrom("accountRep").selectAll().where("userId", "=", rep.id).execute();
    expect(kept).toHaveLength(1);
  });

  it("refuses reps, growers and supervisors with 403 JSON and changes nothing", async () => {
    const user = await fixtureUser({ name: "Perpetua Voss", role: "rep", regionId: sandhollow });
    for (const key of ["rep1", "grower1", "supervisor"]) {
      const client = await signedInAs(key);
      const res = await client.json(`/api/users/${user.id}`, "PATCH", {
        role: "admin",
        status: "deactivated",
      });
      expect(res.status, key).toBe(403);
      expect(res.headers.get("content-type")).toContain("application/json");
      expect((await res.json()).error).toEqual(expect.any(String));
    }
    expect(await userRow(user.id)).toEqual({ role: "rep", regionId: sandhollow, status: "active" });
  });

  it("answers a supervisor 404 for a user of another region, as if there were none", async () => {
    const user = await fixtureUser({ name: "Ottilie Brandt", role: "rep", regionId: upperMesa });
    const res = await (await signedInAs("supervisor")).json(`/api/users/${user.id}`, "PATCH", {
      role: "admin",
    });
    expect(res.status).toBe(404);
    expect((await res.json()).error).toMatch(/no such user/i);
    expect(await userRow(user.id)).toEqual({ role: "rep", regionId: upperMesa, status: "active" });
  });

  it("answers 404 JSON for a non-uuid id and for an unknown user", async () => {
    for (const id of ["not-a-uuid", "1", "' or 1=1 --", randomUUID()]) {
      const res = await admin.json(`/api/users/${encodeURIComponent(id)}`, "PATCH", { role: "rep" });
      expect(res.status, id).toBe(404);
      expect((await res.json()).error).toMatch(/no such user/i);
    }
  });
});

describe("regions", () => {
  it("creates a region with its sync cursor, and refuses a duplicate name with 409 and a clear message", async () => {
    const name = `Admin Fixture Region ${tag}`;
    const res = await admin.json("/api/regions", "POST", { name: `  ${name} ` });
    expect(res.status).toBe(201);
    const { region } = await res.json();
    expect(region.name).toBe(name);
    const cursor = await db
      .selectFrom("syncCursor")
      .selectAll()
      .where("regionId", "=", region.id)
      .executeTakeFirst();
    expect(cursor).toEqual({ regionId: region.id, version: 0 });

    for (const dup of [name, name.toUpperCase()]) {
      const again = await admin.json("/api/regions", "POST", { name: dup });
      expect(again.status).toBe(409);
      expect((await again.json()).error).toMatch(/already exists/);
    }
    const count = await db.selectFrom("region").select("id").where("name", "ilike", name).execute();
    expect(count).toHaveLength(1);

    const listed = await admin.fetch("/api/regions");
    const regions = (await listed.json()).regions as {
      id: string;
      name: string;
      accountCount: number;
      userCount: number;
    }[];
    expect(regions.find((r) => r.id === region.id)).toEqual(
      expect.objectContaining({ name, accountCount: 0, userCount: 0 }),
    );
  });

  it("validates the name and lets only admins create regions", async () => {
    const empty = await admin.json("/api/regions", "POST", { name: "   " });
    expect(empty.status).toBe(422);
    expect((await empty.json()).issues[0].path).toBe("name");
    for (const key of ["supervisor", "rep1", "grower1"]) {
      const res = await (await signedInAs(key)).json("/api/regions", "POST", {
        name: `Admin Fixture Region ${tag} ${key}`,
      });
      expect(res.status, key).toBe(403);
    }
    const made = await db
      .selectFrom("region")
      .select("id")
      .where("name", "like", `Admin Fixture Region ${tag} %`)
      .execute();
    expect(made).toEqual([]);
  });

  it("lists regions with counts for admins, supervisors and reps, and refuses growers", async () => {
    const count = async (table: "account" | "appUser") =>
      Number(
        (
          await db
            .selectFrom(table)
            .select((eb) => eb.fn.countAll<string>().as("n"))
            .where("regionId", "=", sandhollow)
            .executeTakeFirstOrThrow()
        ).n,
      );
    const expected = { accountCount: await count("account"), userCount: await count("appUser") };
    expect(expected.accountCount).toBeGreaterThan(0);
    for (const key of ["supervisor", "rep1"]) {
      const res = await (await signedInAs(key)).fetch("/api/regions");
      expect(res.status, key).toBe(200);
      const regions = (await res.json()).regions as {
        name: string;
        accountCount: number;
        userCount: number;
      }[];
      expect(regions.find((r) => r.name === "Sandhollow Valley")).toMatchObject(expected);
    }
    expect((await (await signedInAs("grower1")).fetch("/api/regions")).status).toBe(403);
  });
});
