// Conflicts for supervisors through the real routes (shared/SYNC.md, "Merge"; issue 5 part 5): the
// list shows both values, who and when, to the supervisor of the region (and admins) only; settling
// writes the chosen value to the record with a new version, so every device receives it on its next
// pull; a deletion settles to the tombstone or to the record restored. Two reps of a fixture region
// make the conflicts (tests/helpers/sync.ts).
import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import { beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { ConflictView } from "@/db/queries/conflicts";
import type { Database } from "@/db/schema";
import { testEnv } from "../helpers/env";
import { type ApiClient, signedInAs } from "../helpers/session";
import {
  assertInvariants,
  createSyncFixture,
  digPayload,
  healthyPlant,
  SimDevice,
  type SyncFixture,
  signIn,
} from "../helpers/sync";

let db: Kysely<Database>;
let fx: SyncFixture;
const api = {} as Record<"repA" | "repB" | "supervisor" | "demoSupervisor" | "admin", ApiClient>;

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  fx = await createSyncFixture(db, "conflicts");
  for (const key of ["repA", "repB", "supervisor"] as const) api[key] = await signIn(fx.users[key]);
  api.demoSupervisor = await signedInAs("supervisor");
  api.admin = await signedInAs("admin");
  return () => db.destroy();
});

type Dig = ReturnType<typeof digPayload>;
type Plant = ReturnType<typeof healthyPlant>;

// A dig both reps have synced, then edited on both devices: A's edit reaches the server first.
async function conflictOn(editA: (d: Dig) => Dig, editB: (d: Dig) => Dig) {
  const a = new SimDevice(api.repA, "A");
  const b = new SimDevice(api.repB, "B");
  const dig = digPayload(fx.shared.fieldId, fx.shared.plantingId, { notes: "first look" });
  const plant = healthyPlant(dig.id, 1, { nodalCount: 9 });
  a.putDig(dig);
  a.putPlant(plant);
  await a.sync();
  await b.pull();
  a.putDig(editA(a.record<Dig>(dig.id)));
  b.putDig(editB(b.record<Dig>(dig.id)));
  await a.push();
  await b.push();
  const conflicts = await db.selectFrom("syncConflict").selectAll().where("recordId", "=", dig.id).execute();
  expect(conflicts).toHaveLength(1);
  return { a, b, dig, plant, conflictId: conflicts[0]!.id };
}

const list = async (who: ApiClient, query = "") => {
  const res = await who.fetch(`/api/conflicts${query}`);
  return { status: res.status, body: (await res.json()) as { conflicts: ConflictView[]; error?: string } };
};
const settle = (who: ApiClient, id: string, body: unknown) =>
  who.json(`/api/conflicts/${id}/settle`, "POST", body);
const digRow = (id: string) =>
  db.selectFrom("digSite").selectAll().where("id", "=", id).executeTakeFirstOrThrow();

describe("conflicts: the supervisor's list", () => {
  it("shows both values, both people and both times to the supervisor of the region", async () => {
    const { a, b, dig, conflictId } = await conflictOn(
      (d) => ({ ...d, notes: "burn on the seed side" }),
      (d) => ({ ...d, notes: "cold injury, not burn" }),
    );
    const { status, body } = await list(api.supervisor, "?settled=false");
    expect(status).toBe(200);
    const conflict = body.conflicts.find((c) => c.id === conflictId);
    expect(conflict).toMatchObject({
      regionId: fx.regionId,
      tableName: "dig_site",
      recordId: dig.id,
      fieldName: "notes",
      serverValue: "burn on the seed side",
      clientValue: "cold injury, not burn",
      serverUser: { id: fx.users.repA.id, name: expect.stringContaining("RepA") },
      clientUser: { id: fx.users.repB.id, name: expect.stringContaining("RepB") },
      settledAt: null,
      settledBy: null,
      dig: {
        id: dig.id,
        accountId: fx.shared.accountId,
        accountName: expect.stringContaining("Sync Shared Farm"),
      },
    });
    expect(Date.parse(conflict!.serverChangedAt!)).not.toBeNaN();
    expect(Date.parse(conflict!.clientObservedAt!)).not.toBeNaN();
    expect(Date.parse(conflict!.clientReceivedAt)).not.toBeNaN();
    expect((await list(api.supervisor, "?settled=true")).body.conflicts.map((c) => c.id)).not.toContain(
      conflictId,
    );
    expect((await list(api.admin)).body.conflicts.map((c) => c.id)).toContain(conflictId);
    // The demo supervisor works in another region.
    expect((await list(api.demoSupervisor)).body.conflicts.map((c) => c.id)).not.toContain(conflictId);
    await assertInvariants(db, [a, b]);
  });

  it("refuses reps and bad filters", async () => {
    expect((await list(api.repA)).status).toBe(403);
    const bad = await list(api.supervisor, "?settled=maybe");
    expect(bad.status).toBe(422);
    expect(bad.body).toMatchObject({ error: expect.any(String), issues: expect.any(Array) });
  });
});

describe("conflicts: settling", () => {
  it("writes the device's value with a new version that reaches both devices", async () => {
    const { a, b, dig, conflictId } = await conflictOn(
      (d) => ({ ...d, notes: "burn on the seed side" }),
      (d) => ({ ...d, notes: "cold injury, not burn" }),
    );
    const before = await digRow(dig.id);
    expect(before.notes).toBe("burn on the seed side");
    const res = await settle(api.supervisor, conflictId, { choice: "client" });
    expect(res.status).toBe(200);
    const answer = (await res.json()) as { conflict: ConflictView; recordVersion: number };
    expect(answer.conflict).toMatchObject({
      id: conflictId,
      settledBy: { id: fx.users.supervisor.id },
      settledValue: "cold injury, not burn",
    });
    const after = await digRow(dig.id);
    expect(after).toMatchObject({ notes: "cold injury, not burn", updatedBy: fx.users.supervisor.id });
    expect(after.version).toBe(answer.recordVersion);
    expect(after.version).toBeGreaterThan(before.version);
    expect((after.fieldVersions as Record<string, number>).notes).toBe(answer.recordVersion);

    expect((await list(api.supervisor, "?settled=true")).body.conflicts.map((c) => c.id)).toContain(
      conflictId,
    );
    expect((await list(api.supervisor, "?settled=false")).body.conflicts.map((c) => c.id)).not.toContain(
      conflictId,
    );
    expect((await settle(api.supervisor, conflictId, { choice: "server" })).status).toBe(409);

    await a.sync();
    await b.sync();
    expect(a.record<Dig>(dig.id).notes).toBe("cold injury, not burn");
    expect(b.record<Dig>(dig.id).notes).toBe("cold injury, not burn");
    await assertInvariants(db, [a, b], { synced: [a, b], conflicts: { [`${dig.id}:notes`]: 1 } });
  });

  it("writes a value of the supervisor's own, checked like the device's", async () => {
    const { a, b, dig, conflictId } = await conflictOn(
      (d) => ({ ...d, soilTempF: 58 }),
      (d) => ({ ...d, soilTempF: 64 }),
    );
    const invalid = await settle(api.supervisor, conflictId, { choice: "custom", value: 400 });
    expect(invalid.status).toBe(422);
    expect(await invalid.json()).toMatchObject({
      issues: [{ path: "value", message: expect.stringMatching(/soil temperature must be from 20 to 120/) }],
    });
    expect((await digRow(dig.id)).soilTempF).toBe(58);
    const ok = await settle(api.supervisor, conflictId, { choice: "custom", value: 61.5 });
    expect(ok.status).toBe(200);
    expect((await digRow(dig.id)).soilTempF).toBe(61.5);
    await a.sync();
    await b.sync();
    await assertInvariants(db, [a, b], { synced: [a, b] });
  });

  it("recomputes the dig when a plant's conflict is settled", async () => {
    const a = new SimDevice(api.repA, "A");
    const b = new SimDevice(api.repB, "B");
    const dig = digPayload(fx.shared.fieldId, fx.shared.plantingId);
    const plant = healthyPlant(dig.id, 1, { nodalCount: 9 });
    a.putDig(dig);
    a.putPlant(plant);
    await a.sync();
    await b.pull();
    a.putPlant({ ...a.record<Plant>(plant.id), nodalCount: 2 });
    b.putPlant({ ...b.record<Plant>(plant.id), nodalCount: 9, nodalWhorls: 2, notes: "recounted: 9" });
    await a.push();
    await b.push();
    // B's plant record kept nodalCount 9 as it knew it and changed only notes: no conflict for that.
    expect(
      await db.selectFrom("syncConflict").select("id").where("recordId", "=", plant.id).execute(),
    ).toEqual([]);
    b.putPlant({ ...b.record<Plant>(plant.id), nodalCount: 11 });
    await b.push();
    const [conflict] = await db
      .selectFrom("syncConflict")
      .selectAll()
      .where("recordId", "=", plant.id)
      .execute();
    expect(conflict).toMatchObject({
      tableName: "dug_plant",
      fieldName: "nodalCount",
      serverValue: 2,
      clientValue: 11,
    });
    const lowIndex = (await digRow(dig.id)).rootIndex!;

    expect((await settle(api.supervisor, conflict!.id, { choice: "client" })).status).toBe(200);
    const stored = await db
      .selectFrom("dugPlant")
      .selectAll()
      .where("id", "=", plant.id)
      .executeTakeFirstOrThrow();
    expect(stored.nodalCount).toBe(11);
    expect(stored.notes).toBe("recounted: 9");
    const site = await digRow(dig.id);
    expect(site.rootIndex).toBeGreaterThan(lowIndex);
    expect(site.rootIndex).toBe(stored.rootIndex);
    await a.sync();
    await b.sync();
    await assertInvariants(db, [a, b], { synced: [a, b], conflicts: { [`${plant.id}:nodalCount`]: 1 } });
  });

  it("restores a record deleted over an edit when the supervisor keeps the edit", async () => {
    const a = new SimDevice(api.repA, "A");
    const b = new SimDevice(api.repB, "B");
    const dig = digPayload(fx.shared.fieldId, null, { notes: "first look" });
    a.putDig(dig);
    await a.sync();
    await b.pull();
    a.putDig({ ...a.record<Dig>(dig.id), notes: "worth keeping" });
    await a.push();
    b.remove("digSite.delete", dig.id);
    await b.push();
    expect((await digRow(dig.id)).deletedAt).not.toBeNull();
    const [conflict] = await db
      .selectFrom("syncConflict")
      .selectAll()
      .where("recordId", "=", dig.id)
      .execute();
    expect(conflict!.fieldName).toBe("deleted");

    expect((await settle(api.supervisor, conflict!.id, { choice: "custom", value: true })).status).toBe(422);
    expect((await settle(api.supervisor, conflict!.id, { choice: "server" })).status).toBe(200);
    const restored = await digRow(dig.id);
    expect(restored).toMatchObject({ deletedAt: null, notes: "worth keeping" });
    await a.sync();
    await b.sync();
    expect(b.local.get(dig.id)).toMatchObject({ deleted: false, values: { notes: "worth keeping" } });
    await assertInvariants(db, [a, b], { synced: [a, b], conflicts: { [`${dig.id}:deleted`]: 1 } });
  });

  it("restores the edit that arrived after a deletion, with its values, when the supervisor keeps it", async () => {
    const a = new SimDevice(api.repA, "A");
    const b = new SimDevice(api.repB, "B");
    const dig = digPayload(fx.shared.fieldId, null, { notes: "first look" });
    a.putDig(dig);
    await a.sync();
    await b.pull();
    a.remove("digSite.delete", dig.id);
    await a.push();
    b.putDig({ ...b.record<Dig>(dig.id), notes: "do not delete: strip trial" });
    await b.push();
    const [conflict] = await db
      .selectFrom("syncConflict")
      .selectAll()
      .where("recordId", "=", dig.id)
      .execute();
    expect((await settle(api.supervisor, conflict!.id, { choice: "client" })).status).toBe(200);
    expect(await digRow(dig.id)).toMatchObject({ deletedAt: null, notes: "do not delete: strip trial" });
    await a.sync();
    await b.sync();
    expect(a.local.get(dig.id)).toMatchObject({
      deleted: false,
      values: { notes: "do not delete: strip trial" },
    });
    await assertInvariants(db, [a, b], { synced: [a, b] });
  });

  it("lets only the supervisor of the region settle, and validates the request", async () => {
    const { a, b, dig, conflictId } = await conflictOn(
      (d) => ({ ...d, recommendation: "Replant the thin strip." }),
      (d) => ({ ...d, recommendation: "Wait a week and recount." }),
    );
    expect((await settle(api.repA, conflictId, { choice: "client" })).status).toBe(403);
    expect((await settle(api.demoSupervisor, conflictId, { choice: "client" })).status).toBe(404);
    expect((await settle(api.supervisor, randomUUID(), { choice: "client" })).status).toBe(404);
    expect((await settle(api.supervisor, "not-a-uuid", { choice: "client" })).status).toBe(404);
    const bad = await settle(api.supervisor, conflictId, { choice: "both" });
    expect(bad.status).toBe(422);
    expect(((await bad.json()) as { issues: unknown[] }).issues).toEqual(expect.any(Array));
    expect((await digRow(dig.id)).recommendation).toBe("Replant the thin strip.");
    // An admin may settle anywhere.
    expect((await settle(api.admin, conflictId, { choice: "server" })).status).toBe(200);
    await a.sync();
    await b.sync();
    await assertInvariants(db, [a, b], { synced: [a, b] });
  });
});
