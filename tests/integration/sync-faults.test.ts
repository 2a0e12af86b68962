import "fake-indexeddb/auto";
// The fault scenarios of shared/SYNC.md driven through the REAL device code (sync/client: saveDig,
// uploadPhotos, push, pull, the runner's cycle) on fake-indexeddb databases, against the real app,
// PostgreSQL and the S3 fake. After each scenario: the five invariants against PostgreSQL
// (assertInvariants) and, for devices that synced completely, each device's database equal to the
// server's view both ways (expectDeviceMatchesServer).
//
// Covered elsewhere, not repeated here:
// - 8 (storage quota during capture): tests/unit/sync-client.test.ts "leaves no record and no outbox
//   entry when storage runs out inside the transaction".
// - 9 in the browser (tab closed while a push is in flight): tests/e2e/sync.spec.ts; the device's
//   half (closed between the answer and its transaction) is below.
// - 11 (overlapping server transactions): tests/integration/sync-pull.test.ts "overlapping writers
//   (SYNC.md fault 11)".
// - 15 (no pull from a service-worker cache): tests/e2e/sync.spec.ts.
// - The injury case opened once across lost answers: tests/integration/sync-push.test.ts; in the
//   browser: tests/e2e/sync.spec.ts.
import http from "node:http";
import { randomUUID } from "node:crypto";
import { HeadObjectCommand, ListObjectsV2Command } from "@aws-sdk/client-s3";
import type { Kysely } from "kysely";
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { bucket, s3 } from "@/lib/storage/s3";
import { openFieldDb } from "@/sync/client/db";
import { SignedOutError, SyncHttpError, UnsupportedVersionError } from "@/sync/client/errors";
import { defaultPut, type PutBytes } from "@/sync/client/photos";
import { type DigSave, loadLocalDig } from "@/sync/client/records";
import { push } from "@/sync/client/push";
import { failureOf } from "@/sync/client/runner";
import { type DugPlantPayload, SCHEMA_VERSION } from "@/sync/protocol";
import { CURSOR_MAX_AGE_MS, decodeCursor, encodeCursor } from "@/sync/server/pull";
import { testEnv } from "../helpers/env";
import { expectCreatedOnServer, expectDeviceMatchesServer, FieldDevice } from "../helpers/field-device";
import { ApiClient } from "../helpers/session";
import {
  assertInvariants,
  createSyncFixture,
  digPayload,
  healthyPlant,
  photoBytes,
  photoPayload,
  type SyncFixture,
  signIn,
} from "../helpers/sync";

let db: Kysely<Database>;
let fx: SyncFixture;
const api = {} as Record<"repA" | "repB", ApiClient>;
const devices: FieldDevice[] = [];

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 4);
  fx = await createSyncFixture(db, "faults");
  api.repA = await signIn(fx.users.repA);
  api.repB = await signIn(fx.users.repB);
});

afterAll(async () => {
  for (const d of devices) await d.destroy().catch(() => undefined);
  await db.destroy();
});

const device = (who: "repA" | "repB", label: string = who) => {
  const d = new FieldDevice(api[who], label);
  devices.push(d);
  return d;
};

const scopeOf = (d: FieldDevice) => ({
  accountIds: d.api === api.repB ? [fx.shared.accountId, fx.other.accountId] : [fx.shared.accountId],
});

/** The five invariants against PostgreSQL; for `synced` devices also invariant 3 both ways. */
async function check(all: FieldDevice[], synced: FieldDevice[] = [], conflicts?: Record<string, number>) {
  const snaps = await Promise.all(all.map((d) => d.snapshot()));
  const syncedSnaps = snaps.filter((_, i) => synced.includes(all[i]!));
  await assertInvariants(db, snaps, { synced: syncedSnaps, conflicts });
  for (const d of all) await expectCreatedOnServer(db, d);
  for (const d of synced) await expectDeviceMatchesServer(db, d, scopeOf(d));
}

const newSite = (over: Parameters<typeof digPayload>[2] = {}) => ({
  ...digPayload(fx.shared.fieldId, fx.shared.plantingId, over),
  accountId: fx.shared.accountId,
});

function newDig(plants = 1): DigSave {
  const site = newSite();
  return {
    site,
    plants: Array.from({ length: plants }, (_, i) => healthyPlant(site.id, i + 1)),
    newPhotos: [],
    removedPlantIds: [],
    removedPhotoIds: [],
  };
}

/** The rep opens a dig on this device, changes it and saves, as the dig form does. */
async function edit(
  d: FieldDevice,
  digId: string,
  patch: Record<string, unknown>,
  more: { addPlants?: DugPlantPayload[] } = {},
) {
  const dig = await loadLocalDig(d.db, digId);
  if (!dig) throw new Error(`${d.label} has no dig ${digId}`);
  await d.save({
    site: { ...dig.site, ...patch },
    plants: [...dig.plants, ...(more.addPlants ?? [])],
    newPhotos: [],
    removedPlantIds: [],
    removedPhotoIds: [],
  });
}

const serverDig = (id: string) =>
  db.selectFrom("digSite").selectAll().where("id", "=", id).executeTakeFirst();
const livePlants = (digId: string) =>
  db
    .selectFrom("dugPlant")
    .select("id")
    .where("digSiteId", "=", digId)
    .where("deletedAt", "is", null)
    .execute();
const conflictRows = (recordId: string) =>
  db.selectFrom("syncConflict").selectAll().where("recordId", "=", recordId).execute();

async function dump(d: FieldDevice) {
  const out: Record<string, unknown[]> = {};
  for (const table of d.db.tables) out[table.name] = await table.toArray();
  return out;
}

describe("fault 1: connection dropped", () => {
  it("before the server sees the push, and after COMMIT before the answer: applied once, outbox kept until acknowledged", async () => {
    const a = device("repA", "A");
    const dig = newDig(2);
    await a.save(dig);

    a.inject("/api/sync/push", "drop-before-send");
    const before = await a.sync().catch((e: unknown) => e);
    expect(failureOf(before).kind).toBe("network");
    expect(await a.outboxIds()).toEqual([1, 2, 3]);
    expect(await serverDig(dig.site.id)).toBeUndefined();

    a.inject("/api/sync/push", "drop-after-commit");
    const after = await a.sync().catch((e: unknown) => e);
    expect(after).toBeInstanceOf(SyncHttpError);
    expect((after as SyncHttpError).status).toBeNull();
    // The server committed; the device never heard, so it keeps every entry.
    expect(await a.outboxIds()).toEqual([1, 2, 3]);
    expect(await livePlants(dig.site.id)).toHaveLength(2);

    // The pull's answer lost as well: the cursor stays where it was.
    a.inject("/api/sync/pull", "drop-after-commit");
    await expect(a.sync()).rejects.toBeInstanceOf(SyncHttpError);
    expect(await a.outboxIds()).toEqual([]);
    expect(await a.cursor()).toBeNull();

    await a.sync();
    expect(await livePlants(dig.site.id)).toHaveLength(2);
    await check([a], [a]);
  });
});

describe("fault 2: server killed before COMMIT", () => {
  it("applies nothing, keeps the outbox, and the retry applies everything once", async () => {
    const a = device("repA", "A");
    const dig = newDig(1);
    await a.save(dig);
    const locker = new pg.Client({ connectionString: testEnv.databaseUrl });
    const admin = new pg.Client({ connectionString: testEnv.superuserUrl });
    await locker.connect();
    await admin.connect();
    let failure: unknown;
    try {
      // Hold the region's version row: the push stops inside its transaction, where it is killed.
      await locker.query("insert into sync_cursor (region_id) values ($1) on conflict do nothing", [
        fx.regionId,
      ]);
      await locker.query("begin");
      await locker.query("select version from sync_cursor where region_id = $1 for update", [fx.regionId]);
      const lockerPid = (await locker.query("select pg_backend_pid() as pid")).rows[0].pid as number;
      const pending = a.sync().catch((e: unknown) => e);
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
      await admin.query("select pg_terminate_backend($1)", [pid]);
      failure = await pending;
    } finally {
      await locker.query("rollback").catch(() => undefined);
      await locker.end();
      await admin.end();
    }
    expect(failure).toBeInstanceOf(SyncHttpError);
    expect(failureOf(failure).kind).toBe("server");
    expect(await a.outboxIds()).toEqual([1, 2]);
    expect(await serverDig(dig.site.id)).toBeUndefined();
    await a.sync();
    expect(await a.outboxIds()).toEqual([]);
    expect(await livePlants(dig.site.id)).toHaveLength(1);
    await check([a], [a]);
  });
});

describe("fault 3: the same batch twice", () => {
  it("delivered twice by the network: the copy is answered as duplicates and changes nothing", async () => {
    const a = device("repA", "A");
    const dig = newDig(2);
    await a.save(dig);
    await a.sync();
    const original = a.sent.find((s) => s.path === "/api/sync/push")!.body;
    const copy = await a.api.json("/api/sync/push", "POST", original);
    expect(copy.status).toBe(200);
    const answer = (await copy.json()) as { lastMutationId: number; results: { duplicate?: boolean }[] };
    expect(answer.lastMutationId).toBe(3);
    expect(answer.results.map((r) => r.duplicate)).toEqual([true, true, true]);
    expect(await livePlants(dig.site.id)).toHaveLength(2);
    await check([a], [a]);
  });

  it("pushed at once from two tabs of one device: each mutation applied once, both tabs' outboxes emptied", async () => {
    const a = device("repA", "A");
    await a.save(newDig(3));
    await a.save(newDig(2));
    // The second tab opens the same database; with no lock between them both push at once.
    const tab2Db = openFieldDb(a.dbName);
    const [one, two] = await Promise.all([
      push(a.db, { fetch: a.fetch, batchSize: 3 }),
      push(tab2Db, { fetch: a.fetch, batchSize: 3 }),
    ]);
    expect(Math.max(one.lastMutationId, two.lastMutationId)).toBe(7);
    expect(await a.outboxIds()).toEqual([]);
    tab2Db.close();
    await a.sync();
    await check([a], [a]);
  });
});

describe("fault 4: reordering", () => {
  it("an old batch arriving after a newer one, and a newer batch arriving first: each applied once", async () => {
    const a = device("repA", "A");
    const dig = newDig(3);
    await a.save(dig);
    await a.push({ batchSize: 2 });
    const pushes = a.sent.filter((s) => s.path === "/api/sync/push");
    expect(pushes).toHaveLength(2);
    // The network delivers the first batch again, after the second.
    const late = await a.api.json("/api/sync/push", "POST", pushes[0]!.body);
    expect(((await late.json()) as { lastMutationId: number }).lastMutationId).toBe(4);

    // Three more plants; the network drops the first two of them and delivers the third first.
    await edit(a, dig.site.id, {}, { addPlants: [4, 5, 6].map((n) => healthyPlant(dig.site.id, n)) });
    expect(await a.outboxIds()).toEqual([5, 6, 7]);
    a.rewriteNext("/api/sync/push", (body) => ({
      ...body,
      mutations: (body.mutations as unknown[]).slice(2),
    }));
    const report = await a.push();
    expect(report.lastMutationId).toBe(7);
    const bodies = a.sent.filter((s) => s.path === "/api/sync/push").slice(2);
    // The gap answer made the device resend from the id the server expected.
    expect(
      bodies.map((b) => (b.body as { mutations: { mutationId: number }[] }).mutations[0]!.mutationId),
    ).toEqual([7, 5]);
    expect(await livePlants(dig.site.id)).toHaveLength(6);
    await a.pull();
    await check([a], [a]);
  });

  it("an old pull answer arriving after a newer one is ignored: the device never goes back", async () => {
    const a = device("repA", "A");
    const b = device("repB", "B");
    const dig = newDig(1);
    await a.save(dig);
    await a.sync();
    await b.sync();
    const start = await a.cursor();

    await edit(b, dig.site.id, { notes: "first edit" });
    await b.sync();
    const slow = a.hold("/api/sync/pull");
    const older = a.pull();
    await slow.arrived;
    await edit(b, dig.site.id, { notes: "second edit" });
    await b.sync();
    const newer = await a.pull();
    expect(newer.applied).toBe(true);
    const newerCursor = await a.cursor();
    slow.release();
    expect(await older).toEqual({ applied: false, full: false });
    expect(await a.cursor()).toBe(newerCursor);
    expect((await a.db.digSites.get(dig.site.id))?.notes).toBe("second edit");
    const versions = [start, newerCursor].map((c) => decodeCursor(c!)!.r[fx.regionId] ?? 0);
    expect(versions[1]).toBeGreaterThan(versions[0]!);
    await check([a, b], [a, b]);
  });
});

describe("fault 5: device clocks ±3 days", () => {
  const DAY = 86_400_000;
  async function scenario(skewA: number, skewB: number) {
    const a = device("repA", "A");
    const b = device("repB", "B");
    a.clockSkewMs = skewA;
    b.clockSkewMs = skewB;
    const dig = newDig(1);
    await a.save(dig);
    await a.sync();
    await b.sync();
    await edit(b, dig.site.id, { notes: "B's note", soilTempF: 55 });
    await edit(a, dig.site.id, { notes: "A's note", irrigatedYet: true });
    await b.sync();
    await a.sync();
    await b.sync();
    const row = await serverDig(dig.site.id);
    const conflicts = await conflictRows(dig.site.id);
    await check([a, b], [a, b], { [`${dig.site.id}:notes`]: 1 });
    return { row: row!, conflicts, dig };
  }

  it("gives the same merge and the same conflict whatever the clocks say", async () => {
    const plain = await scenario(0, 0);
    const skewed = await scenario(3 * DAY, -3 * DAY);
    for (const f of ["notes", "soilTempF", "irrigatedYet", "soilMoisture"] as const) {
      expect(skewed.row[f], f).toEqual(plain.row[f]);
    }
    expect(skewed.row.notes).toBe("B's note");
    expect(skewed.conflicts.map((c) => [c.fieldName, c.serverValue, c.clientValue])).toEqual(
      plain.conflicts.map((c) => [c.fieldName, c.serverValue, c.clientValue]),
    );
    // Device time is kept as observed-at data only.
    const observed = skewed.conflicts[0]!.clientObservedAt!.getTime();
    expect(Math.abs(observed - (Date.now() + 3 * DAY))).toBeLessThan(10 * 60_000);
  });
});

describe("fault 6: two devices edit one dig", () => {
  it("keeps different fields from both, one conflict row for the same field, and every plant either adds", async () => {
    const a = device("repA", "A");
    const b = device("repB", "B");
    const dig = newDig(1);
    await a.save(dig);
    await a.sync();
    await b.sync();

    await edit(a, dig.site.id, { notes: "crusting on the east end" });
    await edit(b, dig.site.id, { soilTempF: 63 });
    await a.sync();
    await b.sync();
    await a.sync();
    expect(await serverDig(dig.site.id)).toMatchObject({ notes: "crusting on the east end", soilTempF: 63 });
    expect(await conflictRows(dig.site.id)).toHaveLength(0);

    await edit(a, dig.site.id, { recommendation: "Move the band to 2 in beside the seed." });
    await edit(b, dig.site.id, { recommendation: "Cut the seed-placed rate in half." });
    await a.sync();
    await b.sync();
    expect((await serverDig(dig.site.id))?.recommendation).toBe("Move the band to 2 in beside the seed.");

    await edit(a, dig.site.id, {}, { addPlants: [healthyPlant(dig.site.id, 2)] });
    await edit(
      b,
      dig.site.id,
      {},
      { addPlants: [healthyPlant(dig.site.id, 3), healthyPlant(dig.site.id, 4)] },
    );
    await a.sync();
    await b.sync();
    await a.sync();
    expect(await livePlants(dig.site.id)).toHaveLength(4);
    expect(await a.db.dugPlants.where("digSiteId").equals(dig.site.id).count()).toBe(4);
    await check([a, b], [a, b], { [`${dig.site.id}:recommendation`]: 1 });
  });
});

describe("fault 7: delete versus edit", () => {
  for (const order of ["delete first", "edit first"] as const) {
    it(`the deletion stands and one conflict row keeps the edit (${order})`, async () => {
      const a = device("repA", "A");
      const b = device("repB", "B");
      const dig = newDig(2);
      await a.save(dig);
      await a.sync();
      await b.sync();
      await a.deleteDig(dig.site.id);
      await edit(b, dig.site.id, { notes: "edited while it was being deleted" });
      const [first, second] = order === "delete first" ? [a, b] : [b, a];
      await first.sync();
      await second.sync();
      await first.sync();
      expect((await serverDig(dig.site.id))?.deletedAt).not.toBeNull();
      expect(await a.db.digSites.get(dig.site.id)).toBeUndefined();
      expect(await b.db.digSites.get(dig.site.id)).toBeUndefined();
      expect(await b.db.dugPlants.where("digSiteId").equals(dig.site.id).count()).toBe(0);
      await check([a, b], [a, b], { [`${dig.site.id}:deleted`]: 1 });
    });
  }
});

describe("fault 9: the tab closes half-way (device side)", () => {
  it("between the push's answer and the device's transaction: the outbox is intact and the retry is answered as duplicates", async () => {
    const a = device("repA", "A");
    const dig = newDig(2);
    await a.save(dig);
    a.inject("/api/sync/push", "close-after-answer");
    const err = await a.sync().catch((e: unknown) => e);
    expect(failureOf(err).kind).toBe("storage");
    a.reopen();
    expect(await a.outboxIds()).toEqual([1, 2, 3]);
    const report = await a.sync();
    expect(report.pushes[0]).toMatchObject({ lastMutationId: 3, acknowledged: 3 });
    expect(await livePlants(dig.site.id)).toHaveLength(2);

    a.inject("/api/sync/pull", "close-after-answer");
    await edit(a, dig.site.id, { notes: "after the reopen" });
    const cursor = await a.cursor();
    await expect(a.sync()).rejects.toBeDefined();
    a.reopen();
    expect(await a.cursor()).toBe(cursor);
    await a.sync();
    await check([a], [a]);
  });
});

describe("fault 10: the session expires during a week offline", () => {
  it("a 401 leaves every mutation in the outbox; signed in again, everything syncs once", async () => {
    const a = device("repA", "A");
    const digIds: string[] = [];
    for (let day = 0; day < 7; day++) {
      a.clockSkewMs = -(7 - day) * 86_400_000;
      const dig = newDig(2);
      digIds.push(dig.site.id);
      await a.save(dig);
    }
    a.clockSkewMs = 0;
    await a.identity();
    const before = await dump(a);
    a.api = new ApiClient();
    const err = await a.sync().catch((e: unknown) => e);
    expect(err).toBeInstanceOf(SignedOutError);
    expect(failureOf(err).kind).toBe("signedOut");
    expect(await dump(a)).toEqual(before);
    expect(await a.outboxIds()).toHaveLength(21);
    expect(await db.selectFrom("digSite").select("id").where("id", "in", digIds).execute()).toEqual([]);

    a.api = api.repA;
    await a.sync();
    expect(await a.outboxIds()).toEqual([]);
    expect(await db.selectFrom("digSite").select("id").where("id", "in", digIds).execute()).toHaveLength(7);
    await check([a], [a]);
  });
});

describe("fault 12: offline longer than the tombstone retention", () => {
  it("the pull resets, the outbox is kept, and no deleted record comes back", async () => {
    const a = device("repA", "A");
    const b = device("repB", "B");
    const gone = newDig(2);
    const kept = newDig(1);
    await a.save(gone);
    await a.save(kept);
    await a.sync();
    await b.sync();
    await b.deleteDig(gone.site.id);
    await b.sync();

    // A has been away for a month: its cursor is older than the retention, and it worked offline.
    await edit(a, kept.site.id, { notes: "written offline a month ago" });
    const fresh = newDig(1);
    await a.save(fresh);
    const cursor = decodeCursor((await a.cursor())!)!;
    await a.db.meta.put({
      key: "cursor",
      value: encodeCursor({ ...cursor, t: Date.now() - CURSOR_MAX_AGE_MS - 3_600_000 }),
    });
    const outbox = await a.outboxIds();

    const result = await a.pull();
    expect(result).toEqual({ applied: true, full: true });
    expect(await a.outboxIds()).toEqual(outbox);
    expect(await a.db.digSites.get(gone.site.id)).toBeUndefined();
    expect(await a.db.dugPlants.where("digSiteId").equals(gone.site.id).count()).toBe(0);
    expect((await a.db.digSites.get(kept.site.id))?.notes).toBe("written offline a month ago");
    expect(await a.db.digSites.get(fresh.site.id)).toBeDefined();

    await a.sync();
    await b.sync();
    expect(await a.db.digSites.get(gone.site.id)).toBeUndefined();
    expect((await serverDig(gone.site.id))?.deletedAt).not.toBeNull();
    expect((await serverDig(kept.site.id))?.notes).toBe("written offline a month ago");
    await check([a, b], [a, b]);
  });
});

// A PUT that dies half-way: the headers promise the whole photo, half the bytes go, the socket closes.
const cutAtHalf: PutBytes = (url, headers, bytes, onProgress) =>
  new Promise((resolve, reject) => {
    const req = http.request(url, {
      method: "PUT",
      headers: { ...headers, "content-length": String(bytes.byteLength) },
    });
    req.on("error", () => reject(new SyncHttpError("The photo upload was cut off.", null)));
    req.on("response", (res) => {
      res.resume();
      resolve(res.statusCode ?? 0);
    });
    const half = new Uint8Array(bytes, 0, bytes.byteLength / 2);
    req.write(half, () => {
      onProgress(half.byteLength);
      setTimeout(() => req.destroy(new Error("cut")), 50);
    });
  });

async function headSize(key: string) {
  try {
    return (await s3.send(new HeadObjectCommand({ Bucket: bucket, Key: key }))).ContentLength ?? null;
  } catch {
    return null;
  }
}

function photoSave(fill: string, size: number, plants = 0): { save: DigSave; bytes: Buffer } {
  const save = newDig(plants);
  const bytes = photoBytes(`${fill} ${randomUUID()}`, size);
  const meta = photoPayload(save.site.id, bytes);
  const buffer = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
  save.newPhotos = [{ meta, bytes: buffer }];
  return { save, bytes };
}

describe("fault 13: photos", () => {
  it("an upload cut at 50 % resumes: the object is complete and confirmed once, then the bytes leave the phone", async () => {
    const a = device("repA", "A");
    const { save, bytes } = photoSave("cut", 256 * 1024);
    const photo = save.newPhotos[0]!.meta;
    await a.save(save);
    let puts = 0;
    const put: PutBytes = (...args) => (puts++ === 0 ? cutAtHalf(...args) : defaultPut(...args));
    await a.sync({ put });
    expect(puts).toBe(2);
    expect(await headSize(`photos/${photo.sha256}`)).toBe(bytes.length);
    expect(
      await db.selectFrom("photoObject").selectAll().where("sha256", "=", photo.sha256).execute(),
    ).toHaveLength(1);
    const row = await db.selectFrom("photo").selectAll().where("id", "=", photo.id).executeTakeFirstOrThrow();
    expect(row.confirmedAt).not.toBeNull();
    expect(await a.db.photoBytes.get(photo.id)).toBeUndefined();
    expect((await a.db.photos.get(photo.id))?.uploaded).toBe(1);
    await check([a], [a]);
  });

  it("the same photo saved twice, on two devices, is one object uploaded once", async () => {
    const a = device("repA", "A");
    const b = device("repB", "B");
    const { save, bytes } = photoSave("twice", 40_000);
    const first = save.newPhotos[0]!;
    const putUrls: string[] = [];
    const counting: PutBytes = (url, ...rest) => {
      putUrls.push(url);
      return defaultPut(url, ...rest);
    };
    await a.save(save);
    await a.sync({ put: counting });
    expect(putUrls).toHaveLength(1);
    await b.sync();
    const second = photoPayload(save.site.id, bytes, { caption: "the same frame from B" });
    const dig = await loadLocalDig(b.db, save.site.id);
    await b.save({
      site: dig!.site,
      plants: dig!.plants,
      newPhotos: [{ meta: second, bytes: first.bytes }],
      removedPlantIds: [],
      removedPhotoIds: [],
    });
    await b.sync({ put: counting });
    await a.sync();
    expect(putUrls).toHaveLength(1);
    const rows = await db
      .selectFrom("photo")
      .select(["id", "objectKey"])
      .where("digSiteId", "=", save.site.id)
      .execute();
    expect(rows).toHaveLength(2);
    expect(new Set(rows.map((r) => r.objectKey))).toEqual(new Set([`photos/${first.meta.sha256}`]));
    const listed = await s3.send(
      new ListObjectsV2Command({ Bucket: bucket, Prefix: `photos/${first.meta.sha256}` }),
    );
    expect(listed.Contents ?? []).toHaveLength(1);
    await check([a, b], [a, b]);
  });

  it("a photo row pushed before its upload is held, never left dangling, and goes through after the upload", async () => {
    const a = device("repA", "A");
    const { save } = photoSave("held", 30_000, 0);
    const photo = save.newPhotos[0]!.meta;
    await a.save(save);
    const plant = healthyPlant(save.site.id, 1);
    await edit(a, save.site.id, {}, { addPlants: [plant] });
    // Push before any upload (as an older tab might).
    const held = await a.push();
    expect(held.held).toMatchObject({ mutationId: 2, photoId: photo.id });
    expect(await a.outboxIds()).toEqual([2, 3]);
    expect(
      await db.selectFrom("photo").select("id").where("id", "=", photo.id).executeTakeFirst(),
    ).toBeUndefined();
    expect(
      await db.selectFrom("dugPlant").select("id").where("id", "=", plant.id).executeTakeFirst(),
    ).toBeUndefined();

    const report = await a.sync();
    expect(report.photosConfirmed).toBe(1);
    expect(await a.outboxIds()).toEqual([]);
    expect(
      (await db.selectFrom("photo").select("confirmedAt").where("id", "=", photo.id).executeTakeFirst())
        ?.confirmedAt,
    ).not.toBeNull();
    expect(await livePlants(save.site.id)).toHaveLength(1);
    await check([a], [a]);
  });
});

describe("fault 14: an outbox written by the previous app version", () => {
  it("is pushed under its own schema version and accepted; an unsupported one keeps the outbox", async () => {
    const a = device("repA", "A");
    const old = newDig(2);
    await a.save(old);
    await a.db.outbox
      .where("mutationId")
      .belowOrEqual(2)
      .modify({ schemaVersion: SCHEMA_VERSION - 1 });
    const unsupported = newDig(0);
    await a.save(unsupported);
    await a.db.outbox
      .where("mutationId")
      .equals(4)
      .modify({ schemaVersion: SCHEMA_VERSION - 2 });

    const err = await a.sync().catch((e: unknown) => e);
    expect(err).toBeInstanceOf(UnsupportedVersionError);
    expect(failureOf(err).kind).toBe("version");
    // The previous version's batch and the current one went through; the unsupported one waits.
    expect(await a.outboxIds()).toEqual([4]);
    const sentVersions = a.sent
      .filter((s) => s.path === "/api/sync/push")
      .map((s) => (s.body as { schemaVersion: number }).schemaVersion);
    expect(sentVersions).toEqual([SCHEMA_VERSION - 1, SCHEMA_VERSION, SCHEMA_VERSION - 2]);
    expect(await livePlants(old.site.id)).toHaveLength(2);

    // The app is updated: the entry is rewritten by the current version and goes through.
    await a.db.outbox.where("mutationId").equals(4).modify({ schemaVersion: SCHEMA_VERSION });
    await a.sync();
    expect(await serverDig(unsupported.site.id)).toBeDefined();
    await check([a], [a]);
  });
});
