// Push through the real route handler (shared/SYNC.md): exactly-once delivery under duplicates,
// concurrent tabs, gaps and lost connections; permanent refusals that never jam the queue; the
// field-by-field merge of two devices (different fields, the same field, plants added on both, delete
// versus edit in both orders, skewed clocks); the server's own assessment and the one injury case it
// opens; authorization and bad payloads. Every scenario ends by checking the five invariants against
// PostgreSQL. Fixtures live in a region of their own (tests/helpers/sync.ts).
import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import pg from "pg";
import { beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { assessDig } from "@/lib/agronomy";
import { assessmentInputFor } from "@/lib/digs/assessment";
import { PROTOCOL_VERSION, SCHEMA_VERSION } from "@/sync/protocol";
import { testEnv } from "../helpers/env";
import { ApiClient } from "../helpers/session";
import {
  assertInvariants,
  burntPlant,
  ConnectionDropped,
  createSyncFixture,
  digPayload,
  healthyPlant,
  type SimDevice as Device,
  SimDevice,
  type SyncFixture,
  signIn,
} from "../helpers/sync";

let db: Kysely<Database>;
let fx: SyncFixture;
const api = {} as Record<"repA" | "repB" | "supervisor" | "grower", ApiClient>;

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 4);
  fx = await createSyncFixture(db, "push");
  for (const key of ["repA", "repB", "supervisor", "grower"] as const) api[key] = await signIn(fx.users[key]);
  return () => db.destroy();
});

const device = (who: "repA" | "repB" | "supervisor" | "grower", label: string = who, clockSkewMs = 0) =>
  new SimDevice(api[who], label, { clockSkewMs });

// The assessment lib/digs/assessment and the agronomy core give for the dig's rows as stored.
async function expectedAssessment(digId: string) {
  const site = await db.selectFrom("digSite").selectAll().where("id", "=", digId).executeTakeFirstOrThrow();
  const plants = await db
    .selectFrom("dugPlant")
    .selectAll()
    .where("digSiteId", "=", digId)
    .where("deletedAt", "is", null)
    .orderBy("position")
    .orderBy("createdAt")
    .orderBy("id")
    .execute();
  const planting = site.plantingId
    ? await db
        .selectFrom("planting")
        .select(["id", "rowSpacingIn", "soilTexture"])
        .where("id", "=", site.plantingId)
        .executeTakeFirstOrThrow()
    : null;
  const assessment = assessDig(
    assessmentInputFor(
      { fieldId: site.fieldId, plantingId: site.plantingId, dugAt: site.dugAt.toISOString() },
      plants,
      planting,
      [],
      [],
    ),
  );
  return { site, plants, assessment };
}

const digRow = (id: string) =>
  db.selectFrom("digSite").selectAll().where("id", "=", id).executeTakeFirstOrThrow();
const livePlants = (digId: string) =>
  db
    .selectFrom("dugPlant")
    .selectAll()
    .where("digSiteId", "=", digId)
    .where("deletedAt", "is", null)
    .execute();
const conflictsOf = (recordId: string) =>
  db
    .selectFrom("syncConflict")
    .selectAll()
    .where("recordId", "=", recordId)
    .orderBy("clientReceivedAt")
    .execute();

describe("push: one dig from one device", () => {
  it("stores a dig, three plants and the server's own root index and assessment", async () => {
    const a = device("repA");
    const dig = digPayload(fx.shared.fieldId, fx.shared.plantingId);
    a.putDig(dig);
    const plants = [1, 2, 3].map((n) => healthyPlant(dig.id, n, { nodalCount: 8 + n }));
    for (const p of plants) a.putPlant(p);
    const answer = await a.push();
    expect(answer.status).toBe(200);
    expect(answer.body).toEqual({
      protocolVersion: PROTOCOL_VERSION,
      lastMutationId: 4,
      results: [1, 2, 3, 4].map((mutationId) => ({ mutationId, status: "applied" })),
    });

    const { site, plants: rows, assessment } = await expectedAssessment(dig.id);
    expect(site).toMatchObject({
      accountId: fx.shared.accountId,
      repId: fx.users.repA.id,
      createdBy: fx.users.repA.id,
      updatedBy: fx.users.repA.id,
      deletedAt: null,
      soilTempF: 61,
    });
    expect(site.version).toBeGreaterThan(0);
    expect(Object.keys(site.fieldVersions as object)).toEqual(
      expect.arrayContaining(["notes", "dugAt", "rootIndex"]),
    );
    expect(rows.map((r) => r.id).sort()).toEqual(plants.map((p) => p.id).sort());
    expect(site.rootIndex).toBe(assessment.siteIndex);
    expect(site.assessment).toEqual(JSON.parse(JSON.stringify(assessment)));
    for (const [i, row] of rows.entries()) expect(row.rootIndex).toBe(assessment.plants[i]!.index);
    expect(assessment.flagForReview.flag).toBe(false);
    const cases = await db.selectFrom("injuryCase").select("id").where("digSiteId", "=", dig.id).execute();
    expect(cases).toEqual([]);

    await a.pull();
    await assertInvariants(db, [a], { synced: [a] });
  });

  it("refuses numbers computed on the device: a dig carrying its own root index is rejected", async () => {
    const a = device("repA");
    const dig = { ...digPayload(fx.shared.fieldId, null), rootIndex: 99 };
    a.queue({ name: "digSite.put", args: dig as never });
    const answer = await a.push();
    expect(answer.status).toBe(200);
    expect(answer.body.results).toEqual([
      { mutationId: 1, status: "rejected", reason: expect.stringMatching(/not valid.*rootIndex/i) },
    ]);
    expect(
      await db.selectFrom("digSite").select("id").where("id", "=", dig.id).executeTakeFirst(),
    ).toBeUndefined();
    await assertInvariants(db, [a]);
  });
});

describe("push: exactly once", () => {
  it("applies the same batch delivered twice once", async () => {
    const a = device("repA");
    const dig = digPayload(fx.shared.fieldId, null);
    a.putDig(dig);
    a.putPlant(healthyPlant(dig.id, 1));
    const body = a.pushBody();
    const first = await a.pushRaw(body);
    const version = (await digRow(dig.id)).version;
    const second = await a.pushRaw(body);
    expect(first.status).toBe(200);
    expect(second.status).toBe(200);
    expect(second.body.lastMutationId).toBe(2);
    expect(second.body.results).toEqual([
      { mutationId: 1, status: "applied", duplicate: true },
      { mutationId: 2, status: "applied", duplicate: true },
    ]);
    expect((await digRow(dig.id)).version).toBe(version);
    expect(await livePlants(dig.id)).toHaveLength(1);
    await assertInvariants(db, [a]);
  });

  it("applies the same batch sent at once from two tabs once", async () => {
    const a = device("repA");
    const dig = digPayload(fx.shared.fieldId, null);
    a.putDig(dig);
    for (const n of [1, 2, 3]) a.putPlant(healthyPlant(dig.id, n));
    const body = a.pushBody();
    const [one, two] = await Promise.all([a.pushRaw(body), a.pushRaw(body)]);
    expect([one.status, two.status]).toEqual([200, 200]);
    // Each mutation was applied by exactly one of the two requests; the other saw a duplicate.
    for (const mutationId of [1, 2, 3, 4]) {
      const fresh = [one, two].filter((r) =>
        r.body.results.some((x) => x.mutationId === mutationId && !x.duplicate),
      );
      expect(fresh, `mutation ${mutationId}`).toHaveLength(1);
    }
    expect(await livePlants(dig.id)).toHaveLength(3);
    await assertInvariants(db, [a]);
  });

  it("refuses a gap with the expected id and applies nothing", async () => {
    const a = device("repA");
    const first = digPayload(fx.shared.fieldId, null);
    const second = digPayload(fx.shared.fieldId, null);
    const e1 = a.putDig(first);
    const e2 = a.putDig(second);
    const gap = await a.push([e2]);
    expect(gap.status).toBe(409);
    expect(gap.body).toMatchObject({
      expectedMutationId: 1,
      lastMutationId: 0,
      error: expect.stringMatching(/missing/),
    });
    expect(
      await db.selectFrom("digSite").select("id").where("id", "in", [first.id, second.id]).execute(),
    ).toEqual([]);

    const unordered = await a.pushRaw(a.pushBody([e2, e1]));
    expect(unordered.status).toBe(422);

    const ok = await a.push();
    expect(ok.body.lastMutationId).toBe(2);
    await assertInvariants(db, [a]);
  });

  it("applies a push once when the connection drops before sending or after the server committed", async () => {
    const a = device("repA");
    const dig = digPayload(fx.shared.fieldId, null);
    a.putDig(dig);
    a.transport.inject("drop-before-send");
    await expect(a.push()).rejects.toBeInstanceOf(ConnectionDropped);
    expect(
      await db.selectFrom("digSite").select("id").where("id", "=", dig.id).executeTakeFirst(),
    ).toBeUndefined();
    expect((await a.push()).body.lastMutationId).toBe(1);

    a.putPlant(healthyPlant(dig.id, 1));
    a.putPlant(healthyPlant(dig.id, 2));
    a.transport.inject("drop-after-commit");
    await expect(a.push()).rejects.toBeInstanceOf(ConnectionDropped);
    // The server committed; the device does not know and still holds both entries.
    expect(a.outbox.map((e) => e.mutationId)).toEqual([2, 3]);
    expect(await livePlants(dig.id)).toHaveLength(2);
    const retry = await a.push();
    expect(retry.body.lastMutationId).toBe(3);
    expect(retry.body.results.every((r) => r.duplicate)).toBe(true);
    expect(a.outbox).toEqual([]);
    expect(await livePlants(dig.id)).toHaveLength(2);
    await a.pull();
    await assertInvariants(db, [a], { synced: [a] });
  });
  it("applies nothing when the push's transaction dies before COMMIT, and the retry applies it once", async () => {
    const a = device("repA");
    const dig = digPayload(fx.shared.fieldId, null);
    a.putDig(dig);
    a.putPlant(healthyPlant(dig.id, 1));
    // Hold the region's version row so the push stops inside its transaction, then cancel it there.
    const locker = new pg.Client({ connectionString: testEnv.databaseUrl });
    const admin = new pg.Client({ connectionString: testEnv.superuserUrl });
    await locker.connect();
    await admin.connect();
    try {
      await locker.query("insert into sync_cursor (region_id) values ($1) on conflict do nothing", [
        fx.regionId,
      ]);
      await locker.query("begin");
      await locker.query("select version from sync_cursor where region_id = $1 for update", [fx.regionId]);
      const lockerPid = (await locker.query("select pg_backend_pid() as pid")).rows[0].pid as number;
      const pending = a.push();
      let pid: number | undefined;
      for (let i = 0; i < 100 && pid === undefined; i++) {
        const { rows } = await admin.query(
          `select pid from pg_stat_activity
            where wait_event_type = 'Lock' and pid <> $1 and query ilike '%sync_cursor%'`,
          [lockerPid],
        );
        pid = rows[0]?.pid;
        if (pid === undefined) await new Promise((r) => setTimeout(r, 50));
      }
      expect(pid, "the push waits inside its transaction").toBeDefined();
      await admin.query("select pg_cancel_backend($1)", [pid]);
      const failed = await pending;
      expect(failed.status).toBe(500);
      expect(failed.body.error).toEqual(expect.any(String));
    } finally {
      await locker.query("rollback").catch(() => undefined);
      await locker.end();
      await admin.end();
    }
    expect(a.outbox).toHaveLength(2);
    expect(
      await db.selectFrom("digSite").select("id").where("id", "=", dig.id).executeTakeFirst(),
    ).toBeUndefined();
    expect(
      await db.selectFrom("syncClient").select("id").where("id", "=", a.clientId).executeTakeFirst(),
    ).toBeUndefined();
    const retry = await a.push();
    expect(retry.body).toMatchObject({
      lastMutationId: 2,
      results: [{ status: "applied" }, { status: "applied" }],
    });
    expect(await livePlants(dig.id)).toHaveLength(1);
    await assertInvariants(db, [a]);
  });
});

describe("push: permanent refusals never jam the queue", () => {
  it("records each refusal with its reason, advances the counter and applies the next mutation", async () => {
    const a = device("repA");
    const invalid = digPayload(fx.shared.fieldId, null, { soilTempF: 500 });
    const elsewhere = digPayload(fx.other.fieldId, null);
    const orphan = healthyPlant(randomUUID(), 1);
    const wrongPlanting = digPayload(fx.shared.secondFieldId, fx.shared.plantingId);
    const good = digPayload(fx.shared.fieldId, null);
    a.putDig(invalid);
    a.putDig(elsewhere);
    a.putPlant(orphan);
    a.putDig(wrongPlanting);
    a.remove("photo.delete", randomUUID());
    a.queue({ name: "dugPlant.teleport", args: { id: randomUUID() } } as never);
    a.putDig(good);
    const answer = await a.push();
    expect(answer.status).toBe(200);
    expect(answer.body.lastMutationId).toBe(7);
    expect(answer.body.results).toEqual([
      {
        mutationId: 1,
        status: "rejected",
        reason: expect.stringMatching(/soil temperature must be from 20 to 120/),
      },
      { mutationId: 2, status: "rejected", reason: expect.stringMatching(/farm you don't serve/) },
      {
        mutationId: 3,
        status: "rejected",
        reason: expect.stringMatching(/dig this record belongs to is not on the server/),
      },
      { mutationId: 4, status: "rejected", reason: expect.stringMatching(/not a planting of its field/) },
      { mutationId: 5, status: "rejected", reason: expect.stringMatching(/Nothing to delete/) },
      { mutationId: 6, status: "rejected", reason: expect.stringMatching(/not valid/) },
      { mutationId: 7, status: "applied" },
    ]);
    const stored = await db
      .selectFrom("syncMutationResult")
      .select(["mutationId", "name", "status", "reason"])
      .where("clientId", "=", a.clientId)
      .orderBy("mutationId")
      .execute();
    expect(stored.map((s) => [s.name, s.status])).toEqual([
      ["digSite.put", "rejected"],
      ["digSite.put", "rejected"],
      ["dugPlant.put", "rejected"],
      ["digSite.put", "rejected"],
      ["photo.delete", "rejected"],
      ["dugPlant.teleport", "rejected"],
      ["digSite.put", "applied"],
    ]);
    const ids = [invalid.id, elsewhere.id, wrongPlanting.id, good.id];
    expect(
      (await db.selectFrom("digSite").select("id").where("id", "in", ids).execute()).map((r) => r.id),
    ).toEqual([good.id]);
    await assertInvariants(db, [a]);
  });

  it("rejects digs pushed by a supervisor or a grower and writes nothing", async () => {
    const s = device("supervisor");
    const g = device("grower");
    const bySupervisor = digPayload(fx.shared.fieldId, null);
    const byGrower = digPayload(fx.shared.fieldId, null);
    s.putDig(bySupervisor);
    g.putDig(byGrower);
    const fromSupervisor = await s.push();
    const fromGrower = await g.push();
    expect(fromSupervisor.body.results).toEqual([
      {
        mutationId: 1,
        status: "rejected",
        reason: expect.stringMatching(/Only the rep who serves this farm/),
      },
    ]);
    expect(fromGrower.body.results).toEqual([
      {
        mutationId: 1,
        status: "rejected",
        reason: expect.stringMatching(/Only the rep who serves this farm/),
      },
    ]);
    const written = await db
      .selectFrom("digSite")
      .select("id")
      .where("id", "in", [bySupervisor.id, byGrower.id])
      .execute();
    expect(written).toEqual([]);
    await assertInvariants(db, [s, g]);
  });
});

// Two devices of two reps serving the same farm, both synced after a dig is created.
async function sharedDig(labelA = "A", labelB = "B", skewA = 0, skewB = 0) {
  const a = device("repA", labelA, skewA);
  const b = device("repB", labelB, skewB);
  const dig = digPayload(fx.shared.fieldId, fx.shared.plantingId, { notes: "first look" });
  const plant = healthyPlant(dig.id, 1);
  a.putDig(dig);
  a.putPlant(plant);
  await a.sync();
  await b.pull();
  return { a, b, dig, plant };
}

describe("push: merging two devices", () => {
  it("keeps both edits when two devices change different fields of one dig", async () => {
    const { a, b, dig } = await sharedDig();
    a.putDig({ ...a.record<typeof dig>(dig.id), notes: "crusting in the wheel tracks" });
    b.putDig({ ...b.record<typeof dig>(dig.id), recommendation: "Recheck after the next irrigation." });
    await a.push();
    const answer = await b.push();
    expect(answer.body.results).toEqual([{ mutationId: 1, status: "applied" }]);
    expect(await digRow(dig.id)).toMatchObject({
      notes: "crusting in the wheel tracks",
      recommendation: "Recheck after the next irrigation.",
    });
    expect(await conflictsOf(dig.id)).toEqual([]);
    await a.sync();
    await b.sync();
    await assertInvariants(db, [a, b], { synced: [a, b], conflicts: { [`${dig.id}:notes`]: 0 } });
  });

  it("keeps the server's value and writes one conflict row when both change the same field", async () => {
    const { a, b, dig } = await sharedDig();
    a.putDig({ ...a.record<typeof dig>(dig.id), notes: "burn on the seed side" });
    const bEdit = b.putDig({ ...b.record<typeof dig>(dig.id), notes: "looks like cold injury" });
    await a.push();
    const answer = await b.push();
    expect(answer.body.results).toEqual([
      { mutationId: 1, status: "applied", reason: expect.stringMatching(/changed notes .* both are saved/) },
    ]);
    expect((await digRow(dig.id)).notes).toBe("burn on the seed side");
    const [conflict, ...more] = await conflictsOf(dig.id);
    expect(more).toEqual([]);
    expect(conflict).toMatchObject({
      regionId: fx.regionId,
      tableName: "dig_site",
      fieldName: "notes",
      serverValue: "burn on the seed side",
      clientValue: "looks like cold injury",
      serverUserId: fx.users.repA.id,
      clientUserId: fx.users.repB.id,
      settledAt: null,
    });
    expect(conflict!.clientObservedAt?.toISOString()).toBe(bEdit.observedAt);
    expect(conflict!.serverChangedAt).not.toBeNull();

    // B edits another field before it hears back: its stale notes raise no second conflict row.
    b.putDig({ ...b.record<typeof dig>(dig.id), soilMoisture: "wet" });
    await b.push();
    expect(await digRow(dig.id)).toMatchObject({ notes: "burn on the seed side", soilMoisture: "wet" });
    await a.sync();
    await b.sync();
    expect(b.record<typeof dig>(dig.id).notes).toBe("burn on the seed side");
    await assertInvariants(db, [a, b], { synced: [a, b], conflicts: { [`${dig.id}:notes`]: 1 } });
  });

  it("applies a device's own later edits of a field without a conflict", async () => {
    const { a, dig } = await sharedDig();
    a.putDig({ ...a.record<typeof dig>(dig.id), notes: "one" });
    await a.push();
    // Still based on the version before its first edit: the change is its own.
    a.putDig({ ...a.record<typeof dig>(dig.id), notes: "two" });
    await a.push();
    expect((await digRow(dig.id)).notes).toBe("two");
    expect(await conflictsOf(dig.id)).toEqual([]);
    await a.sync();
    await assertInvariants(db, [a], { synced: [a] });
  });

  it("keeps every plant when both devices add plants to one dig", async () => {
    const { a, b, dig } = await sharedDig();
    const fromA = [2, 3].map((n) => healthyPlant(dig.id, n));
    const fromB = [2, 3].map((n) => healthyPlant(dig.id, n, { nodalCount: 7 }));
    for (const p of fromA) a.putPlant(p);
    for (const p of fromB) b.putPlant(p);
    await Promise.all([a.push(), b.push()]);
    const plants = await livePlants(dig.id);
    expect(plants).toHaveLength(5);
    expect(plants.map((p) => p.id)).toEqual(expect.arrayContaining([...fromA, ...fromB].map((p) => p.id)));
    const { site, assessment } = await expectedAssessment(dig.id);
    expect(site.rootIndex).toBe(assessment.siteIndex);
    expect(plants.every((p) => p.rootIndex !== null)).toBe(true);
    await a.sync();
    await b.sync();
    await assertInvariants(db, [a, b], { synced: [a, b] });
  });

  it("deletes and records a conflict when a delete meets an edit it had not seen", async () => {
    const { a, b, dig } = await sharedDig();
    a.putDig({ ...a.record<typeof dig>(dig.id), notes: "second opinion: salt burn" });
    await a.push();
    b.remove("digSite.delete", dig.id);
    const answer = await b.push();
    expect(answer.body.results[0]).toMatchObject({
      status: "applied",
      reason: expect.stringMatching(/edited.*deleted/),
    });
    const row = await digRow(dig.id);
    expect(row.deletedAt).not.toBeNull();
    expect(row.notes).toBe("second opinion: salt burn");
    const conflicts = await conflictsOf(dig.id);
    expect(conflicts).toHaveLength(1);
    expect(conflicts[0]).toMatchObject({
      fieldName: "deleted",
      serverUserId: fx.users.repA.id,
      clientUserId: fx.users.repB.id,
      serverValue: {
        deleted: false,
        record: expect.objectContaining({ id: dig.id, notes: "second opinion: salt burn" }),
      },
      clientValue: { deleted: true },
    });
    await a.sync();
    await b.sync();
    await assertInvariants(db, [a, b], { synced: [a, b], conflicts: { [`${dig.id}:deleted`]: 1 } });
  });

  it("keeps the tombstone and records a conflict when an edit arrives for a deleted record", async () => {
    const { a, b, dig, plant } = await sharedDig();
    a.remove("dugPlant.delete", plant.id);
    await a.push();
    const versionAfterDelete = (
      await db.selectFrom("dugPlant").select("version").where("id", "=", plant.id).executeTakeFirstOrThrow()
    ).version;
    b.putPlant({ ...b.record<typeof plant>(plant.id), notes: "lesions on the mesocotyl" });
    const answer = await b.push();
    expect(answer.body.results[0]).toMatchObject({
      status: "applied",
      reason: expect.stringMatching(/deletion stands/),
    });
    const row = await db
      .selectFrom("dugPlant")
      .selectAll()
      .where("id", "=", plant.id)
      .executeTakeFirstOrThrow();
    expect(row.deletedAt).not.toBeNull();
    expect(row.notes).toBeNull();
    expect(row.version).toBeGreaterThan(versionAfterDelete);
    const conflicts = await conflictsOf(plant.id);
    expect(conflicts).toHaveLength(1);
    expect(conflicts[0]).toMatchObject({
      tableName: "dug_plant",
      fieldName: "deleted",
      serverValue: { deleted: true },
      clientValue: { deleted: false, record: expect.objectContaining({ notes: "lesions on the mesocotyl" }) },
    });
    // The dig's assessment no longer counts the deleted plant.
    expect((await digRow(dig.id)).rootIndex).toBeNull();
    await a.sync();
    await b.sync();
    await assertInvariants(db, [a, b], { synced: [a, b], conflicts: { [`${plant.id}:deleted`]: 1 } });
  });

  it("reaches the same result whatever the devices' clocks say (±3 days)", async () => {
    const DAY = 24 * 3_600_000;
    async function scenario(skewA: number, skewB: number) {
      const { a, b, dig } = await sharedDig("A", "B", skewA, skewB);
      // B edits first by its clock (A's runs three days ahead), A reaches the server first.
      b.putDig({ ...b.record<typeof dig>(dig.id), notes: "B's note", soilMoisture: "dry" });
      a.putDig({
        ...a.record<typeof dig>(dig.id),
        notes: "A's note",
        recommendation: "Hold the side-dress.",
      });
      await a.push();
      await b.push();
      await a.sync();
      await b.sync();
      await assertInvariants(db, [a, b], { synced: [a, b], conflicts: { [`${dig.id}:notes`]: 1 } });
      const row = await digRow(dig.id);
      const [conflict] = await conflictsOf(dig.id);
      return {
        stored: { notes: row.notes, soilMoisture: row.soilMoisture, recommendation: row.recommendation },
        conflict: {
          server: conflict!.serverValue,
          client: conflict!.clientValue,
          observedAt: conflict!.clientObservedAt,
        },
      };
    }
    const plain = await scenario(0, 0);
    const skewed = await scenario(3 * DAY, -3 * DAY);
    expect(skewed.stored).toEqual(plain.stored);
    expect(skewed.stored).toEqual({
      notes: "A's note",
      soilMoisture: "dry",
      recommendation: "Hold the side-dress.",
    });
    expect([skewed.conflict.server, skewed.conflict.client]).toEqual([
      plain.conflict.server,
      plain.conflict.client,
    ]);
    // The device time is kept as observed, skew and all.
    expect(Math.abs(skewed.conflict.observedAt!.getTime() - Date.now() + 3 * DAY)).toBeLessThan(60_000);
  });
});

describe("push: injury cases", () => {
  it("opens exactly one injury case for a dig sent for review, across lost answers and retries", async () => {
    const a = device("repA");
    const dig = digPayload(fx.shared.fieldId, fx.shared.plantingId);
    a.putDig(dig);
    const plants = [1, 2, 3].map((n) => burntPlant(dig.id, n));
    for (const p of plants) a.putPlant(p);
    a.transport.inject("drop-after-commit");
    await expect(a.push()).rejects.toBeInstanceOf(ConnectionDropped);
    await a.push();
    // A later edit recomputes the dig again.
    a.putDig({ ...dig, notes: "burn on every plant" });
    a.putPlant({ ...plants[0]!, notes: "worst of the three" });
    await a.push();

    const { site, assessment } = await expectedAssessment(dig.id);
    expect(assessment.flagForReview.flag).toBe(true);
    expect((site.assessment as { flagForReview: { flag: boolean } }).flagForReview.flag).toBe(true);
    const cases = await db.selectFrom("injuryCase").selectAll().where("digSiteId", "=", dig.id).execute();
    expect(cases).toHaveLength(1);
    expect(cases[0]).toMatchObject({ accountId: fx.shared.accountId, status: "new", severity: "critical" });
    const events = await db
      .selectFrom("injuryCaseEvent")
      .selectAll()
      .where("caseId", "=", cases[0]!.id)
      .execute();
    expect(events.map((e) => e.kind)).toEqual(["opened"]);
    expect(events[0]!.body).toMatch(/critical/);

    // Evidence of an open case cannot be deleted: refused with the reason, and the queue moves on.
    a.remove("dugPlant.delete", plants[1]!.id);
    a.putDig({ ...dig, notes: "case opened" });
    const refused = await a.push();
    expect(refused.body.results).toEqual([
      { mutationId: 7, status: "rejected", reason: expect.stringMatching(/open injury case/) },
      { mutationId: 8, status: "applied" },
    ]);
    expect(await livePlants(dig.id)).toHaveLength(3);
    await a.pull();
    await assertInvariants(db, [a], { synced: [a] });
  });

  it("opens a caution case for a dig the rep flagged with roots on track, and none for an unflagged one", async () => {
    const a = device("repA");
    const flagged = digPayload(fx.shared.fieldId, fx.shared.plantingId, { flaggedByRep: true });
    const plain = digPayload(fx.shared.fieldId, fx.shared.plantingId);
    a.putDig(flagged);
    a.putPlant(healthyPlant(flagged.id, 1));
    a.putDig(plain);
    a.putPlant(healthyPlant(plain.id, 1));
    await a.push();
    const cases = await db
      .selectFrom("injuryCase")
      .select(["digSiteId", "severity"])
      .where("digSiteId", "in", [flagged.id, plain.id])
      .execute();
    expect(cases).toEqual([{ digSiteId: flagged.id, severity: "caution" }]);
    await assertInvariants(db, [a]);
  });
});

describe("push: identity, versions and bad payloads", () => {
  it("refuses a client group that belongs to another user", async () => {
    const a = device("repA");
    a.putDig(digPayload(fx.shared.fieldId, null));
    expect((await a.push()).status).toBe(200);
    const intruder = new SimDevice(api.repB, "intruder", { clientGroupId: a.clientGroupId });
    intruder.putDig(digPayload(fx.shared.fieldId, null));
    const answer = await intruder.push();
    expect(answer.status).toBe(403);
    expect(answer.body.error).toMatch(/another user/);
    await assertInvariants(db, [a, intruder]);
  });

  it("answers an unsupported protocol or schema version with 409 and accepts the previous schema", async () => {
    const a: Device = device("repA");
    a.putDig(digPayload(fx.shared.fieldId, null));
    for (const [protocolVersion, schemaVersion] of [
      [PROTOCOL_VERSION + 1, SCHEMA_VERSION],
      [PROTOCOL_VERSION - 1, SCHEMA_VERSION],
      [PROTOCOL_VERSION, SCHEMA_VERSION + 1],
      [PROTOCOL_VERSION, SCHEMA_VERSION - 2],
    ]) {
      const answer = await a.pushRaw({ ...a.pushBody(), protocolVersion, schemaVersion });
      expect(answer.status, `${protocolVersion}/${schemaVersion}`).toBe(409);
      expect(answer.body.error).toMatch(/kept/);
    }
    expect(
      await db.selectFrom("syncClient").select("id").where("id", "=", a.clientId).executeTakeFirst(),
    ).toBeUndefined();
    const previous = await a.pushRaw({ ...a.pushBody(), schemaVersion: SCHEMA_VERSION - 1 });
    expect(previous.status).toBe(200);
    expect(previous.body.lastMutationId).toBe(1);
    await assertInvariants(db, [a]);
  });

  it("answers bad requests with 4xx JSON, never 500", async () => {
    const a = device("repA");
    const base = a.pushBody([]);
    const cases: [string, RequestInit, number][] = [
      ["not JSON", { body: "{", headers: { "content-type": "application/json" } }, 400],
      ["not application/json", { body: "{}", headers: { "content-type": "text/plain" } }, 415],
      ["no client id", { body: JSON.stringify({ ...base, clientId: undefined }) }, 422],
      ["mutations not a list", { body: JSON.stringify({ ...base, mutations: {} }) }, 422],
      ["mutation id zero", { body: JSON.stringify({ ...base, mutations: [{ mutationId: 0 }] }) }, 422],
      ["unknown key", { body: JSON.stringify({ ...base, extra: 1 }) }, 422],
      [
        "too many",
        {
          body: JSON.stringify({
            ...base,
            mutations: Array.from({ length: 501 }, (_, i) => ({ mutationId: i + 1 })),
          }),
        },
        422,
      ],
    ];
    for (const [name, init, status] of cases) {
      const res = await api.repA.fetch("/api/sync/push", {
        method: "POST",
        ...init,
        headers: init.headers ?? { "content-type": "application/json" },
      });
      expect(res.status, name).toBe(status);
      const json = (await res.json()) as { error: string; issues?: unknown[] };
      expect(json.error, name).toEqual(expect.any(String));
      if (status === 422 && name !== "too many") expect(json.issues, name).toEqual(expect.any(Array));
    }
    const signedOut = await new ApiClient().json("/api/sync/push", "POST", base);
    expect(signedOut.status).toBe(401);
    expect(await signedOut.json()).toEqual({ error: expect.any(String) });
  });
});
