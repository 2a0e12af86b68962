// Photos through the real routes and the S3 fake (shared/SYNC.md, fault 13): presign → PUT → confirm
// → push; a photo row pushed before its upload is held and applied once the object is confirmed; the
// same photo twice is one object; an upload cut halfway is refused at confirm and resumes; presign
// only for digs the user may write, in the allowed types and sizes; the signature binds type and size.
import { randomUUID } from "node:crypto";
import { HeadObjectCommand, ListObjectsV2Command } from "@aws-sdk/client-s3";
import type { Kysely } from "kysely";
import { beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { bucket, s3 } from "@/lib/storage/s3";
import { MAX_PHOTO_BYTES } from "@/sync/protocol";
import { testEnv } from "../helpers/env";
import type { ApiClient } from "../helpers/session";
import {
  assertInvariants,
  createSyncFixture,
  digPayload,
  healthyPlant,
  photoBytes,
  photoPayload,
  SimDevice,
  type SyncFixture,
  sha256Hex,
  signIn,
  uploadPhoto,
} from "../helpers/sync";

let db: Kysely<Database>;
let fx: SyncFixture;
const api = {} as Record<"repA" | "repB" | "supervisor" | "grower", ApiClient>;

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  fx = await createSyncFixture(db, "photos");
  for (const key of ["repA", "repB", "supervisor", "grower"] as const) api[key] = await signIn(fx.users[key]);
  return () => db.destroy();
});

const photoRow = (id: string) => db.selectFrom("photo").selectAll().where("id", "=", id).executeTakeFirst();
const objectsUnder = async (key: string) =>
  (await s3.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: key }))).Contents ?? [];

function presignBody(photo: ReturnType<typeof photoPayload>, over: Record<string, unknown> = {}) {
  return {
    photoId: photo.id,
    digSiteId: photo.digSiteId,
    fieldId: null,
    sha256: photo.sha256,
    byteSize: photo.byteSize,
    contentType: photo.contentType,
    ...over,
  };
}

describe("photos: upload first, referenced second", () => {
  it("uploads a photo of a dig not pushed yet, then pushes the dig, its plants and the photo", async () => {
    const a = new SimDevice(api.repA, "A");
    const dig = digPayload(fx.shared.fieldId, fx.shared.plantingId);
    const plants = [1, 2, 3].map((n) => healthyPlant(dig.id, n));
    const bytes = photoBytes(`first ${fx.suffix}`);
    const photo = photoPayload(dig.id, bytes, { dugPlantId: plants[0]!.id, caption: "plant 1, seed side" });
    expect(await uploadPhoto(api.repA, photo, bytes, fx.shared.fieldId)).toEqual({ uploaded: true });

    a.putDig(dig);
    for (const p of plants) a.putPlant(p);
    a.putPhoto(photo);
    const answer = await a.push();
    expect(answer.body.results.map((r) => r.status)).toEqual([
      "applied",
      "applied",
      "applied",
      "applied",
      "applied",
    ]);

    const row = await photoRow(photo.id);
    expect(row).toMatchObject({
      digSiteId: dig.id,
      dugPlantId: plants[0]!.id,
      sha256: photo.sha256,
      byteSize: bytes.length,
      contentType: "image/jpeg",
      objectKey: `photos/${photo.sha256}`,
      caption: "plant 1, seed side",
      createdBy: fx.users.repA.id,
      deletedAt: null,
    });
    expect(row!.confirmedAt).not.toBeNull();
    const head = await s3.send(new HeadObjectCommand({ Bucket: bucket, Key: row!.objectKey }));
    expect(head.ContentLength).toBe(bytes.length);
    expect(head.ContentType).toBe("image/jpeg");
    const site = await db
      .selectFrom("digSite")
      .select("rootIndex")
      .where("id", "=", dig.id)
      .executeTakeFirstOrThrow();
    expect(site.rootIndex).not.toBeNull();

    await a.pull();
    await assertInvariants(db, [a], { synced: [a] });
  });

  it("holds a photo pushed before its upload, then applies it once the object is confirmed", async () => {
    const a = new SimDevice(api.repA, "A");
    const dig = digPayload(fx.shared.fieldId, null);
    const bytes = photoBytes(`held ${fx.suffix}`, 20_000);
    const photo = photoPayload(dig.id, bytes);
    const plant = healthyPlant(dig.id, 1);
    a.putDig(dig);
    a.putPhoto(photo);
    a.putPlant(plant);

    const held = await a.push();
    expect(held.status).toBe(200);
    expect(held.body).toMatchObject({
      lastMutationId: 1,
      heldAt: 2,
      reason: expect.stringMatching(/not uploaded yet/),
      results: [{ mutationId: 1, status: "applied" }],
    });
    expect(await photoRow(photo.id)).toBeUndefined();
    expect(
      await db.selectFrom("dugPlant").select("id").where("id", "=", plant.id).executeTakeFirst(),
    ).toBeUndefined();
    expect(a.outbox.map((e) => e.mutationId)).toEqual([2, 3]);
    // Still held on a retry without the upload: never dangling, never skipped.
    expect((await a.push()).body.heldAt).toBe(2);
    await assertInvariants(db, [a]);

    // The dig is on the server now, so no fieldId is needed.
    await uploadPhoto(api.repA, photo, bytes);
    const resumed = await a.push();
    expect(resumed.body).toMatchObject({
      lastMutationId: 3,
      results: [{ mutationId: 2 }, { mutationId: 3 }],
    });
    expect(resumed.body.heldAt).toBeUndefined();
    expect((await photoRow(photo.id))?.confirmedAt).not.toBeNull();
    await a.pull();
    await assertInvariants(db, [a], { synced: [a] });
  });

  it("stores the same photo twice as one object", async () => {
    const a = new SimDevice(api.repA, "A");
    const dig = digPayload(fx.shared.fieldId, null);
    const bytes = photoBytes(`twice ${fx.suffix}`, 30_000);
    const first = photoPayload(dig.id, bytes);
    const second = photoPayload(dig.id, bytes, { caption: "same frame, saved again" });
    expect(await uploadPhoto(api.repA, first, bytes, fx.shared.fieldId)).toEqual({ uploaded: true });
    expect(await uploadPhoto(api.repA, second, bytes, fx.shared.fieldId)).toEqual({ uploaded: false });
    const again = await api.repA.json(
      "/api/photos/presign",
      "POST",
      presignBody(second, { fieldId: fx.shared.fieldId }),
    );
    expect(await again.json()).toEqual({ exists: true, key: `photos/${first.sha256}`, confirmed: true });

    a.putDig(dig);
    a.putPhoto(first);
    a.putPhoto(second);
    await a.push();
    const rows = await db
      .selectFrom("photo")
      .select(["id", "objectKey"])
      .where("digSiteId", "=", dig.id)
      .execute();
    expect(rows).toHaveLength(2);
    expect(new Set(rows.map((r) => r.objectKey))).toEqual(new Set([`photos/${first.sha256}`]));
    expect(await objectsUnder(`photos/${first.sha256}`)).toHaveLength(1);
    const objects = await db
      .selectFrom("photoObject")
      .selectAll()
      .where("sha256", "=", first.sha256)
      .execute();
    expect(objects).toHaveLength(1);
    await assertInvariants(db, [a]);
  });

  it("refuses an upload cut halfway at confirm, and accepts it when resumed", async () => {
    const dig = digPayload(fx.shared.fieldId, null);
    const bytes = photoBytes(`cut ${fx.suffix}`, 64 * 1024);
    const photo = photoPayload(dig.id, bytes);
    const presign = async () =>
      (await (
        await api.repA.json("/api/photos/presign", "POST", presignBody(photo, { fieldId: fx.shared.fieldId }))
      ).json()) as { exists: boolean; url: string; headers: Record<string, string> };

    const first = await presign();
    expect(first.exists).toBe(false);
    // The connection dies halfway: the store is left with half the bytes.
    const half = new Uint8Array(bytes.subarray(0, bytes.length / 2));
    expect((await fetch(first.url, { method: "PUT", body: half, headers: first.headers })).status).toBe(200);
    const refused = await api.repA.json("/api/photos/confirm", "POST", {
      sha256: photo.sha256,
      byteSize: bytes.length,
    });
    expect(refused.status).toBe(422);
    expect(((await refused.json()) as { error: string }).error).toMatch(/upload it again/);
    expect(await objectsUnder(`photos/${photo.sha256}`)).toHaveLength(0);

    const second = await presign();
    expect(second.exists).toBe(false);
    await fetch(second.url, { method: "PUT", body: new Uint8Array(bytes), headers: second.headers });
    const confirmed = await api.repA.json("/api/photos/confirm", "POST", {
      sha256: photo.sha256,
      byteSize: bytes.length,
    });
    expect(confirmed.status).toBe(200);
    expect(await confirmed.json()).toEqual({ confirmed: true });
  });

  it("refuses bytes that do not match their hash, and a photo not uploaded at all", async () => {
    const bytes = photoBytes(`mismatch ${fx.suffix}`, 10_000);
    const claimed = sha256Hex(photoBytes(`other ${fx.suffix}`, 10_000));
    const dig = digPayload(fx.shared.fieldId, null);
    const photo = photoPayload(dig.id, bytes, { sha256: claimed });
    const missing = await api.repA.json("/api/photos/confirm", "POST", {
      sha256: claimed,
      byteSize: bytes.length,
    });
    expect(missing.status).toBe(422);
    expect(((await missing.json()) as { error: string }).error).toMatch(/not in the store yet/);

    const presign = (await (
      await api.repA.json("/api/photos/presign", "POST", presignBody(photo, { fieldId: fx.shared.fieldId }))
    ).json()) as { url: string; headers: Record<string, string> };
    await fetch(presign.url, { method: "PUT", body: new Uint8Array(bytes), headers: presign.headers });
    const wrong = await api.repA.json("/api/photos/confirm", "POST", {
      sha256: claimed,
      byteSize: bytes.length,
    });
    expect(wrong.status).toBe(422);
    expect(((await wrong.json()) as { error: string }).error).toMatch(/do not match/);
    expect(await objectsUnder(`photos/${claimed}`)).toHaveLength(0);
    expect(
      await db.selectFrom("photoObject").select("sha256").where("sha256", "=", claimed).executeTakeFirst(),
    ).toBeUndefined();
  });

  it("signs the PUT for the content type and size, for five minutes", async () => {
    const dig = digPayload(fx.shared.fieldId, null);
    const bytes = photoBytes(`signed ${fx.suffix}`, 5000);
    const photo = photoPayload(dig.id, bytes, { contentType: "image/webp" });
    const res = await api.repA.json(
      "/api/photos/presign",
      "POST",
      presignBody(photo, { fieldId: fx.shared.fieldId }),
    );
    expect(res.status).toBe(200);
    const answer = (await res.json()) as {
      url: string;
      method: string;
      key: string;
      headers: Record<string, string>;
    };
    const url = new URL(answer.url);
    expect(answer).toMatchObject({
      method: "PUT",
      key: `photos/${photo.sha256}`,
      headers: { "content-type": "image/webp" },
    });
    expect(url.pathname).toBe(`/${testEnv.bucket}/photos/${photo.sha256}`);
    expect(url.searchParams.get("X-Amz-Expires")).toBe("300");
    expect(url.searchParams.get("X-Amz-SignedHeaders")?.split(";")).toEqual(
      expect.arrayContaining(["content-length", "content-type", "host"]),
    );
  });
});

describe("photos: who may upload what", () => {
  it("gives presigned URLs only for digs the user may write", async () => {
    const owner = new SimDevice(api.repB, "B");
    const otherDig = digPayload(fx.other.fieldId, null);
    const sharedDig = digPayload(fx.shared.fieldId, null);
    owner.putDig(otherDig);
    owner.putDig(sharedDig);
    await owner.push();
    const bytes = photoBytes(`guarded ${fx.suffix}`, 4000);

    const ask = (who: ApiClient, over: Record<string, unknown>) =>
      who.json("/api/photos/presign", "POST", presignBody(photoPayload(sharedDig.id, bytes), over));
    const cases: [string, ApiClient, Record<string, unknown>, number][] = [
      ["rep, a dig of a farm they don't serve", api.repA, { digSiteId: otherDig.id }, 404],
      [
        "rep, a new dig on a field of a farm they don't serve",
        api.repA,
        { digSiteId: randomUUID(), fieldId: fx.other.fieldId },
        404,
      ],
      ["rep, an unknown dig without its field", api.repA, { digSiteId: randomUUID() }, 404],
      ["supervisor of the region", api.supervisor, {}, 403],
      ["grower of the farm", api.grower, {}, 403],
      ["rep who serves the farm", api.repA, {}, 200],
      ["wrong content type", api.repA, { contentType: "image/gif" }, 422],
      ["too big", api.repA, { byteSize: MAX_PHOTO_BYTES + 1 }, 422],
      ["empty", api.repA, { byteSize: 0 }, 422],
      ["not a hash", api.repA, { sha256: "abc" }, 422],
      ["not a dig id", api.repA, { digSiteId: "dig-1" }, 422],
    ];
    for (const [name, who, over, status] of cases) {
      const res = await ask(who, over);
      expect(res.status, name).toBe(status);
      const json = (await res.json()) as { error?: string; issues?: unknown[]; url?: string };
      if (status === 422) expect(json.issues, name).toEqual(expect.any(Array));
      if (status !== 200) expect(json.url, name).toBeUndefined();
    }
    const confirmBySupervisor = await api.supervisor.json("/api/photos/confirm", "POST", {
      sha256: sha256Hex(bytes),
      byteSize: bytes.length,
    });
    expect(confirmBySupervisor.status).toBe(403);
    await assertInvariants(db, [owner]);
  });

  it("rejects a photo row for a plant of another dig, and a changed picture under an existing photo", async () => {
    const a = new SimDevice(api.repA, "A");
    const dig = digPayload(fx.shared.fieldId, null);
    const elsewhere = digPayload(fx.shared.fieldId, null);
    const plantElsewhere = healthyPlant(elsewhere.id, 1);
    const bytes = photoBytes(`strays ${fx.suffix}`, 6000);
    const photo = photoPayload(dig.id, bytes);
    await uploadPhoto(api.repA, photo, bytes, fx.shared.fieldId);
    a.putDig(dig);
    a.putDig(elsewhere);
    a.putPlant(plantElsewhere);
    a.putPhoto({ ...photo, id: randomUUID(), dugPlantId: plantElsewhere.id });
    a.putPhoto(photo);
    const other = photoBytes(`strays 2 ${fx.suffix}`, 6000);
    a.putPhoto({ ...photo, sha256: sha256Hex(other) });
    const answer = await a.push();
    expect(answer.body.results.slice(3)).toEqual([
      { mutationId: 4, status: "rejected", reason: expect.stringMatching(/not a plant of its dig/) },
      { mutationId: 5, status: "applied" },
      { mutationId: 6, status: "rejected", reason: expect.stringMatching(/picture can't change/) },
    ]);
    expect((await photoRow(photo.id))?.sha256).toBe(photo.sha256);
    await assertInvariants(db, [a]);
  });
});
