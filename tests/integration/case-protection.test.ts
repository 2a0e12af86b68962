// The evidence of an open injury case stays (issue 7): a field device running the real client code
// deletes a plant and a photo of a dig whose case is open; sync push acknowledges both deletes as
// refused for good with a plain reason (nothing waits in the outbox, nothing is retried), and the
// next pull gives the device its plant and photo back. PostgreSQL itself refuses a tombstone or a
// hard delete of the dig, its plants or photos while the case is open, whoever writes; once the case
// is closed the same device delete goes through.
import "fake-indexeddb/auto";
import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { type DigSave, loadLocalDig } from "@/sync/client/records";
import { testEnv } from "../helpers/env";
import { FieldDevice } from "../helpers/field-device";
import type { ApiClient } from "../helpers/session";
import {
  burntPlant,
  createSyncFixture,
  digPayload,
  photoBytes,
  photoPayload,
  type SyncFixture,
  signIn,
} from "../helpers/sync";

let db: Kysely<Database>;
let fx: SyncFixture;
let rep: ApiClient;
let supervisor: ApiClient;
const devices: FieldDevice[] = [];

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  fx = await createSyncFixture(db, "case-guard");
  rep = await signIn(fx.users.repA);
  supervisor = await signIn(fx.users.supervisor);
});

afterAll(async () => {
  for (const d of devices) await d.destroy().catch(() => undefined);
  await db.destroy();
});

const OPEN_CASE = /open injury case/;

/** A burnt dig with three plants and one photo, saved on a new device and synced: its case opens. */
async function burntDigOnDevice() {
  const device = new FieldDevice(rep, "repA");
  devices.push(device);
  const site = { ...digPayload(fx.shared.fieldId, fx.shared.plantingId), accountId: fx.shared.accountId };
  const plants = [1, 2, 3].map((n) => burntPlant(site.id, n));
  const bytes = photoBytes(`case guard ${randomUUID()}`, 30_000);
  const photo = photoPayload(site.id, bytes, { dugPlantId: plants[0]!.id, caption: "band beside the seed" });
  const save: DigSave = {
    site,
    plants,
    newPhotos: [
      {
        meta: photo,
        bytes: bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer,
      },
    ],
    removedPlantIds: [],
    removedPhotoIds: [],
  };
  await device.save(save);
  await device.syncFully();
  const injuryCase = await db
    .selectFrom("injuryCase")
    .selectAll()
    .where("digSiteId", "=", site.id)
    .executeTakeFirstOrThrow();
  expect(injuryCase.status).toBe("new");
  return { device, site, plants, photo, caseId: injuryCase.id };
}

/** The rep removes a plant and a photo in the dig form and saves, as the app does. */
async function removeOnDevice(device: FieldDevice, digId: string, plantId: string, photoId: string) {
  const dig = await loadLocalDig(device.db, digId);
  if (!dig) throw new Error("the device lost the dig");
  await device.save({
    site: dig.site,
    plants: dig.plants.filter((p) => p.id !== plantId),
    newPhotos: [],
    removedPlantIds: [plantId],
    removedPhotoIds: [photoId],
  });
}

const live = async (table: "dugPlant" | "photo", id: string) =>
  (await db.selectFrom(table).select("deletedAt").where("id", "=", id).executeTakeFirstOrThrow())
    .deletedAt === null;

async function decideAndClose(caseId: string) {
  const v0 = (
    await db.selectFrom("injuryCase").select("version").where("id", "=", caseId).executeTakeFirstOrThrow()
  ).version;
  const decided = await supervisor.json(`/api/cases/${caseId}/events`, "POST", {
    action: "decide",
    decision: "injury_confirmed",
    reason: "Burn on every plant next to a seed-placed band.",
    expectedVersion: v0,
  });
  expect(decided.status).toBe(201);
  const { case: c } = (await decided.json()) as { case: { version: number } };
  const closed = await supervisor.json(`/api/cases/${caseId}/events`, "POST", {
    action: "close",
    expectedVersion: c.version,
  });
  expect(closed.status).toBe(201);
}

describe("deletes from a device while the case is open", () => {
  it("are acknowledged as refused with a plain reason, never retried, and the pull restores them", async () => {
    const { device, site, plants, photo, caseId } = await burntDigOnDevice();
    await removeOnDevice(device, site.id, plants[1]!.id, photo.id);
    expect(await device.db.dugPlants.get(plants[1]!.id)).toBeUndefined();

    const report = await device.sync();
    const rejected = report.pushes.flatMap((p) => p.rejected);
    expect(rejected.map((r) => [r.name, r.recordId])).toEqual(
      expect.arrayContaining([
        ["dugPlant.delete", plants[1]!.id],
        ["photo.delete", photo.id],
      ]),
    );
    for (const r of rejected) expect(r.reason).toMatch(OPEN_CASE);
    // Acknowledged: nothing waits to be pushed again.
    expect(await device.outboxIds()).toEqual([]);
    const results = await db
      .selectFrom("syncMutationResult")
      .select(["name", "status", "reason"])
      .where("clientId", "=", (await device.identity()).clientId)
      .where("name", "in", ["dugPlant.delete", "photo.delete"])
      .execute();
    expect(results).toHaveLength(2);
    for (const r of results)
      expect(r).toMatchObject({ status: "rejected", reason: expect.stringMatching(OPEN_CASE) });

    // The server kept both, and the device has them back after the cycle's pull.
    expect(await live("dugPlant", plants[1]!.id)).toBe(true);
    expect(await live("photo", photo.id)).toBe(true);
    await device.sync();
    expect(await device.db.dugPlants.get(plants[1]!.id)).toBeDefined();
    expect(await device.db.photos.get(photo.id)).toBeDefined();
    expect(
      (await db.selectFrom("injuryCase").select("status").where("id", "=", caseId).executeTakeFirstOrThrow())
        .status,
    ).toBe("new");
  });

  it("go through once the case is closed", async () => {
    const { device, site, plants, photo, caseId } = await burntDigOnDevice();
    await decideAndClose(caseId);
    await removeOnDevice(device, site.id, plants[2]!.id, photo.id);
    const report = await device.sync();
    expect(report.pushes.flatMap((p) => p.rejected)).toEqual([]);
    expect(await live("dugPlant", plants[2]!.id)).toBe(false);
    expect(await live("photo", photo.id)).toBe(false);
  });
});

describe("PostgreSQL guards the evidence of an open case", () => {
  it("refuses tombstones and hard deletes of the dig, its plants and photos, whoever writes", async () => {
    const { site, plants, photo } = await burntDigOnDevice();
    const attempts = [
      () =>
        db.updateTable("dugPlant").set({ deletedAt: new Date() }).where("id", "=", plants[0]!.id).execute(),
      () => db.updateTable("photo").set({ deletedAt: new Date() }).where("id", "=", photo.id).execute(),
      () => db.updateTable("digSite").set({ deletedAt: new Date() }).where("id", "=", site.id).execute(),
      () => db.deleteFrom("photo").where("id", "=", photo.id).execute(),
      () => db.deleteFrom("dugPlant").where("id", "=", plants[2]!.id).execute(),
    ];
    for (const attempt of attempts) {
      await expect(attempt()).rejects.toMatchObject({
        code: "23001",
        message: expect.stringMatching(OPEN_CASE),
      });
    }
    expect(await live("dugPlant", plants[0]!.id)).toBe(true);
    expect(await live("photo", photo.id)).toBe(true);
    const dig = await db
      .selectFrom("digSite")
      .select("deletedAt")
      .where("id", "=", site.id)
      .executeTakeFirstOrThrow();
    expect(dig.deletedAt).toBeNull();
    // Edits that delete nothing still go through.
    await db
      .updateTable("photo")
      .set({ caption: "band 0.5 in beside the seed" })
      .where("id", "=", photo.id)
      .execute();
  });

  it("lets them go once the case is closed", async () => {
    const { plants, photo, caseId } = await burntDigOnDevice();
    await decideAndClose(caseId);
    await db.updateTable("photo").set({ deletedAt: new Date() }).where("id", "=", photo.id).execute();
    await db.updateTable("dugPlant").set({ deletedAt: new Date() }).where("id", "=", plants[0]!.id).execute();
    expect(await live("photo", photo.id)).toBe(false);
    expect(await live("dugPlant", plants[0]!.id)).toBe(false);
  });
});
