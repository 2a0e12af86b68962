import "fake-indexeddb/auto";
import { createHash, randomUUID } from "node:crypto";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { ZodError } from "zod";
import {
  type DigSitePayload,
  type DugPlantPayload,
  type PhotoPayload,
  PROTOCOL_VERSION,
  type PullResponse,
  pullResponseSchema,
  SCHEMA_VERSION,
} from "@/sync/protocol";
import { type FieldDatabase, openFieldDb } from "@/sync/client/db";
import { SignedOutError, SyncHttpError, UnsupportedVersionError } from "@/sync/client/errors";
import { getClientIdentity } from "@/sync/client/identity";
import { applyPull, PULL_META, pull, pullNow, syncStatus } from "@/sync/client/pull";
import {
  clearDraft,
  loadDraft,
  loadLocalDig,
  pendingCounts,
  saveDig,
  saveDraft,
} from "@/sync/client/records";
import { classifyStorageError } from "@/sync/client/storage";

// The field app's local database layer against fake-indexeddb: the write path (records + outbox in one
// transaction), drafts, and applying pull pages with the protocol's real schemas.

let db: FieldDatabase;
let dbName: string;

beforeEach(async () => {
  dbName = `trenchbook-test-${randomUUID()}`;
  db = openFieldDb(dbName);
  await db.open();
});

afterEach(async () => {
  db.close();
  await openFieldDb(dbName).delete();
});

const accountId = randomUUID();
const regionId = randomUUID();
const stationId = randomUUID();
const productId = randomUUID();

function site(overrides: Partial<DigSitePayload> = {}): DigSitePayload & { accountId: string } {
  return {
    id: randomUUID(),
    fieldId: randomUUID(),
    plantingId: null,
    dugAt: "2026-05-14T16:20:00.000Z",
    latitude: 41.12,
    longitude: -101.7,
    accuracyM: 6,
    soilMoisture: "moist",
    soilTempF: 58,
    irrigatedYet: false,
    recommendation: null,
    flaggedByRep: false,
    notes: null,
    ...overrides,
    accountId,
  };
}

function plant(
  digSiteId: string,
  position: number,
  overrides: Partial<DugPlantPayload> = {},
): DugPlantPayload {
  return {
    id: randomUUID(),
    digSiteId,
    position,
    leafStage: "V3",
    seedingDepthIn: 2,
    crownDepthIn: 0.75,
    mesocotyl: "healthy",
    seminalScore: 4,
    nodalWhorls: 2,
    nodalCount: 7,
    longestNodalIn: 4.5,
    seminalInjury: "none",
    nodalInjury: "none",
    findings: [],
    bandBesideIn: 2,
    bandBelowIn: 2,
    notes: null,
    ...overrides,
  };
}

function photo(digSiteId: string, dugPlantId: string | null, fill: number) {
  const bytes = new Uint8Array(64).fill(fill).buffer;
  const meta: PhotoPayload = {
    id: randomUUID(),
    digSiteId,
    dugPlantId,
    sha256: createHash("sha256").update(new Uint8Array(bytes)).digest("hex"),
    byteSize: bytes.byteLength,
    contentType: "image/jpeg",
    width: 2048,
    height: 1536,
    caption: null,
    capturedAt: "2026-05-14T16:25:00.000Z",
  };
  return { meta, bytes };
}

async function dump(d: FieldDatabase) {
  const out: Record<string, unknown[]> = {};
  for (const table of d.tables) out[table.name] = await table.toArray();
  return out;
}

// ---- the write path ----------------------------------------------------------------------------

describe("saveDig", () => {
  it("writes the site, plants, photos, photo bytes and one outbox entry per record with increasing ids", async () => {
    const s = site();
    const plants = [plant(s.id, 1), plant(s.id, 2, { leafStage: "V2" }), plant(s.id, 3)];
    const photos = [photo(s.id, null, 1), photo(s.id, plants[0]!.id, 2)];
    await saveDig(db, { site: s, plants, newPhotos: photos, removedPlantIds: [], removedPhotoIds: [] });

    const stored = await loadLocalDig(db, s.id);
    expect(stored?.site).toMatchObject({ ...s, syncState: "waiting", serverVersion: null });
    expect(stored?.plants.map((p) => p.id)).toEqual(plants.map((p) => p.id));
    expect(stored?.photos.map((p) => p.id).sort()).toEqual(photos.map((p) => p.meta.id).sort());
    for (const p of photos) {
      const bytes = await db.photoBytes.get(p.meta.id);
      expect(new Uint8Array(bytes!.bytes)).toEqual(new Uint8Array(p.bytes));
    }

    const outbox = await db.outbox.orderBy("mutationId").toArray();
    expect(outbox.map((e) => e.mutationId)).toEqual([1, 2, 3, 4, 5, 6]);
    expect(outbox.map((e) => [e.name, e.recordId])).toEqual([
      ["digSite.put", s.id],
      ...plants.map((p) => ["dugPlant.put", p.id]),
      ...photos.map((p) => ["photo.put", p.meta.id]),
    ]);
    expect(outbox.every((e) => e.baseVersion === null && e.schemaVersion === SCHEMA_VERSION)).toBe(true);
    // The payload queued is exactly the protocol record, without local columns.
    expect(outbox[0]!.args).toEqual(Object.fromEntries(Object.entries(s).filter(([k]) => k !== "accountId")));
    expect(await pendingCounts(db)).toEqual({ mutations: 6, photos: 2 });
  });

  it("queues nothing when saved again unchanged, and only the changed record after an edit", async () => {
    const s = site();
    const plants = [plant(s.id, 1), plant(s.id, 2)];
    const save = { site: s, plants, newPhotos: [], removedPlantIds: [], removedPhotoIds: [] };
    await saveDig(db, save);
    expect(await db.outbox.count()).toBe(3);

    await saveDig(db, save);
    expect(await db.outbox.count()).toBe(3);

    const edited = { ...plants[1]!, nodalCount: 9 };
    await saveDig(db, { ...save, plants: [plants[0]!, edited] });
    const outbox = await db.outbox.orderBy("mutationId").toArray();
    expect(outbox.map((e) => e.mutationId)).toEqual([1, 2, 3, 4]);
    expect(outbox[3]).toMatchObject({ name: "dugPlant.put", recordId: edited.id, args: edited });
  });

  it("throws on an invalid plant and writes nothing", async () => {
    const s = site();
    const bad = plant(s.id, 2, { leafStage: "V19" as DugPlantPayload["leafStage"] });
    await expect(
      saveDig(db, {
        site: s,
        plants: [plant(s.id, 1), bad],
        newPhotos: [photo(s.id, null, 3)],
        removedPlantIds: [],
        removedPhotoIds: [],
      }),
    ).rejects.toBeInstanceOf(ZodError);
    const all = await dump(db);
    for (const [name, rows] of Object.entries(all)) expect(rows, name).toEqual([]);
  });

  it("leaves no record and no outbox entry when storage runs out inside the transaction", async () => {
    const earlier = site();
    await saveDig(db, { site: earlier, plants: [], newPhotos: [], removedPlantIds: [], removedPhotoIds: [] });
    const before = await dump(db);

    db.photoBytes.hook("creating", () => {
      throw new DOMException("The quota has been exceeded.", "QuotaExceededError");
    });
    const s = site();
    const error = await saveDig(db, {
      site: s,
      plants: [plant(s.id, 1)],
      newPhotos: [photo(s.id, null, 4)],
      removedPlantIds: [],
      removedPhotoIds: [],
      draftKey: "dig:new",
    }).then(
      () => null,
      (err: unknown) => err,
    );
    expect(error).not.toBeNull();
    expect(classifyStorageError(error)).toBe("quota");
    expect(await db.digSites.get(s.id)).toBeUndefined();
    expect(await db.dugPlants.where("digSiteId").equals(s.id).count()).toBe(0);
    expect(await db.photos.where("digSiteId").equals(s.id).count()).toBe(0);
    expect(await dump(db)).toEqual(before);
  });

  it("removing an unsynced photo deletes its bytes and queues its removal", async () => {
    const s = site();
    const kept = photo(s.id, null, 5);
    const removed = photo(s.id, null, 6);
    const save = {
      site: s,
      plants: [],
      newPhotos: [kept, removed],
      removedPlantIds: [],
      removedPhotoIds: [],
    };
    await saveDig(db, save);
    expect(await db.photoBytes.count()).toBe(2);

    await saveDig(db, { ...save, newPhotos: [], removedPhotoIds: [removed.meta.id] });
    expect(await db.photos.get(removed.meta.id)).toBeUndefined();
    expect(await db.photoBytes.get(removed.meta.id)).toBeUndefined();
    expect(await db.photoBytes.get(kept.meta.id)).toBeDefined();
    const last = await db.outbox.orderBy("mutationId").last();
    expect(last).toMatchObject({
      name: "photo.delete",
      recordId: removed.meta.id,
      args: { id: removed.meta.id },
    });
  });

  it("keeps a draft across a reopen of the database and clears it with the save that completes it", async () => {
    const s = site();
    const draft = { site: s, plants: [plant(s.id, 1, { nodalCount: null })] };
    await saveDraft(db, "dig:new", draft);
    db.close();

    db = openFieldDb(dbName);
    await db.open();
    expect(await loadDraft(db, "dig:new")).toEqual(draft);
    await saveDraft(db, "dig:other", { note: "kept" });

    await saveDig(db, {
      site: s,
      plants: draft.plants,
      newPhotos: [],
      removedPlantIds: [],
      removedPhotoIds: [],
      draftKey: "dig:new",
    });
    expect(await loadDraft(db, "dig:new")).toBeNull();
    expect(await loadDraft(db, "dig:other")).toEqual({ note: "kept" });
    await clearDraft(db, "dig:other");
    expect(await loadDraft(db, "dig:other")).toBeNull();
  });
});

// ---- pull --------------------------------------------------------------------------------------

const fieldId = randomUUID();
const plantingId = randomUUID();

function fieldRow(version: number, overrides: Record<string, unknown> = {}) {
  return {
    id: fieldId,
    accountId,
    name: "North pivot",
    boundary: null,
    areaAcres: 126.4,
    centroidLat: 41.1,
    centroidLon: -101.7,
    irrigation: "furrow",
    soilTexture: "medium" as const,
    weatherStationId: stationId,
    firstIrrigationOn: null,
    version,
    deleted: false,
    ...overrides,
  };
}

function serverSite(s: DigSitePayload, version: number, deleted = false) {
  return {
    ...s,
    accountId,
    repId: randomUUID(),
    rootIndex: 0.92,
    assessment: { flags: [] },
    version,
    deleted,
  };
}

function serverPlant(p: DugPlantPayload, version: number, deleted = false) {
  return { ...p, rootIndex: 0.9, version, deleted };
}

function serverPhoto(p: PhotoPayload, version: number, deleted = false) {
  return { ...p, confirmedAt: "2026-05-14T18:00:00.000Z", version, deleted };
}

type ChangeInput = Partial<{ [K in keyof PullResponse["changes"]]: unknown[] }>;

// A response as the server sends it, checked against the protocol's schema.
function response(
  cursor: string,
  changes: ChangeInput = {},
  extra: Partial<PullResponse> = {},
): PullResponse {
  return pullResponseSchema.parse({
    protocolVersion: PROTOCOL_VERSION,
    cursor,
    reset: false,
    lastMutationIds: {},
    rejections: [],
    changes: {
      accounts: [{ id: accountId, name: "Alder Creek Farms", locality: "Sandhollow", regionId }],
      fields: [],
      plantings: [],
      fertilizerPasses: [],
      products: [
        {
          id: productId,
          name: "ammonium polyphosphate 10-34-0",
          chemistry: "ammonium polyphosphate solution",
          form: "liquid",
          n: 10,
          p2o5: 34,
          k2o: 0,
          s: 0,
          lbPerGal: 11.65,
          densitySource: "fixture",
          saltIndex: 20,
          saltIndexSource: "fixture",
          containsUrea: false,
          containsThiosulfate: false,
        },
      ],
      weather: [
        { stationId, day: "2026-05-01", maxF: 71.2, minF: 44.1 },
        { stationId, day: "2026-05-02", maxF: 74.5, minF: 47 },
      ],
      digSites: [],
      dugPlants: [],
      photos: [],
      ...changes,
    },
    ...extra,
  });
}

interface Stub {
  fetch: typeof fetch;
  requests: { url: string; body: Record<string, unknown> }[];
}

function stubFetch(...answers: (() => Response)[]): Stub {
  const requests: Stub["requests"] = [];
  const queue = [...answers];
  const fetchStub = async (input: RequestInfo | URL, init?: RequestInit) => {
    requests.push({ url: String(input), body: JSON.parse(String(init?.body)) });
    const next = queue.shift();
    if (!next) throw new Error("unexpected request");
    return next();
  };
  return { fetch: fetchStub as typeof fetch, requests };
}

const json =
  (body: unknown, status = 200) =>
  () =>
    new Response(JSON.stringify(body), {
      status,
      headers: { "content-type": "application/json; charset=utf-8" },
    });

// A device that has pulled once: one synced dig with a plant and a photo, and the reference data.
async function syncedDevice() {
  const s = site({ fieldId, plantingId });
  const p = plant(s.id, 1);
  const ph = photo(s.id, p.id, 9);
  const stub = stubFetch(
    json(
      response("c1", {
        fields: [fieldRow(3)],
        digSites: [serverSite(s, 4)],
        dugPlants: [serverPlant(p, 4)],
        photos: [serverPhoto(ph.meta, 5)],
      }),
    ),
  );
  await pull(db, { fetch: stub.fetch });
  // The photo was taken on this device: its bytes are here too.
  await db.photoBytes.put({ id: ph.meta.id, bytes: ph.bytes });
  return { site: s, plant: p, photo: ph, stub };
}

describe("pull", () => {
  it("asks with the device identity and stores the page, the cursor and the pull time together", async () => {
    const s = site({ fieldId });
    const p = plant(s.id, 1);
    const stub = stubFetch(
      json(
        response("c1", {
          fields: [fieldRow(3)],
          digSites: [serverSite(s, 4)],
          dugPlants: [serverPlant(p, 4)],
        }),
      ),
    );
    const result = await pull(db, { fetch: stub.fetch, now: new Date("2026-05-15T07:00:00Z") });
    expect(result).toEqual({ applied: true, full: true });

    const identity = await getClientIdentity(db);
    expect(stub.requests).toEqual([
      {
        url: "/api/sync/pull",
        body: {
          protocolVersion: PROTOCOL_VERSION,
          schemaVersion: SCHEMA_VERSION,
          clientGroupId: identity.clientGroupId,
          cursor: null,
        },
      },
    ]);
    expect((await db.meta.get(PULL_META.cursor))?.value).toBe("c1");
    expect((await db.meta.get(PULL_META.lastPullAt))?.value).toBe("2026-05-15T07:00:00.000Z");
    expect(await db.fields.get(fieldId)).toMatchObject({ name: "North pivot", version: 3 });
    expect(await db.fields.get(fieldId)).not.toHaveProperty("deleted");
    expect(await db.products.count()).toBe(1);
    expect(await db.weather.get([stationId, "2026-05-02"])).toMatchObject({ maxF: 74.5 });
    expect(await db.digSites.get(s.id)).toMatchObject({
      syncState: "synced",
      serverVersion: 4,
      rootIndex: 0.92,
    });
    expect(await db.dugPlants.get(p.id)).toMatchObject({ syncState: "synced", serverVersion: 4 });

    // The next pull carries the stored cursor.
    const next = stubFetch(json(response("c2")));
    await pull(db, { fetch: next.fetch });
    expect(next.requests[0]!.body.cursor).toBe("c1");
    expect((await db.meta.get(PULL_META.cursor))?.value).toBe("c2");
  });

  it("stores the cursor in the same transaction as the page: a failure while applying keeps the old cursor", async () => {
    await syncedDevice();
    const before = await dump(db);
    db.weather.hook("creating", () => {
      throw new DOMException("The quota has been exceeded.", "QuotaExceededError");
    });
    const stub = stubFetch(json(response("c2", { fields: [fieldRow(7, { name: "Renamed" })] })));
    const error = await pull(db, { fetch: stub.fetch }).then(
      () => null,
      (err: unknown) => err,
    );
    expect(classifyStorageError(error)).toBe("quota");
    expect((await db.meta.get(PULL_META.cursor))?.value).toBe("c1");
    expect(await dump(db)).toEqual(before);
  });

  it("keeps local values of records with changes waiting and replaces the others", async () => {
    const device = await syncedDevice();
    const edited = { ...device.plant, nodalCount: 12, notes: "re-counted" };
    const second = plant(device.site.id, 2);
    await saveDig(db, {
      site: { ...device.site, accountId },
      plants: [edited, second],
      newPhotos: [],
      removedPlantIds: [],
      removedPhotoIds: [],
    });
    const outbox = await db.outbox.toArray();
    expect(outbox.map((e) => e.recordId).sort()).toEqual([edited.id, second.id].sort());

    const stub = stubFetch(
      json(
        response("c2", {
          digSites: [serverSite({ ...device.site, recommendation: "Side-dress as planned." }, 8)],
          dugPlants: [serverPlant({ ...device.plant, nodalCount: 6 }, 8)],
        }),
      ),
    );
    await pull(db, { fetch: stub.fetch });

    // The plant with a change waiting keeps the rep's values and the base its change was made on.
    expect(await db.dugPlants.get(edited.id)).toMatchObject({
      nodalCount: 12,
      notes: "re-counted",
      syncState: "waiting",
      serverVersion: 4,
    });
    // The site had nothing waiting: the server's copy lands.
    expect(await db.digSites.get(device.site.id)).toMatchObject({
      recommendation: "Side-dress as planned.",
      syncState: "synced",
      serverVersion: 8,
    });
    expect(await db.outbox.toArray()).toEqual(outbox);
  });

  it("drops outbox entries the server acknowledged and lets the server copy land; refusals show their reason", async () => {
    const device = await syncedDevice();
    const { clientId } = await getClientIdentity(db);
    const edited = { ...device.plant, nodalCount: 12 };
    const refused = plant(device.site.id, 2, { notes: "refused" });
    const later = plant(device.site.id, 3);
    const save = {
      site: { ...device.site, accountId },
      newPhotos: [],
      removedPlantIds: [],
      removedPhotoIds: [],
    };
    await saveDig(db, { ...save, plants: [edited, refused] });
    await saveDig(db, { ...save, plants: [edited, refused, later] });
    const ids = (await db.outbox.orderBy("mutationId").toArray()).map((e) => [e.mutationId, e.recordId]);
    expect(ids).toEqual([
      [1, edited.id],
      [2, refused.id],
      [3, later.id],
    ]);

    const stub = stubFetch(
      json(
        response(
          "c2",
          { dugPlants: [serverPlant(edited, 9)] },
          {
            lastMutationIds: { [clientId]: 2, [randomUUID()]: 40 },
            rejections: [
              { clientId, mutationId: 2, name: "dugPlant.put", reason: "The dig site was deleted." },
            ],
          },
        ),
      ),
    );
    await pull(db, { fetch: stub.fetch });
    expect((await db.outbox.toArray()).map((e) => e.mutationId)).toEqual([3]);
    expect(await db.dugPlants.get(edited.id)).toMatchObject({
      nodalCount: 12,
      syncState: "synced",
      serverVersion: 9,
    });
    expect(await db.dugPlants.get(refused.id)).toMatchObject({
      syncState: "rejected",
      rejectionReason: "The dig site was deleted.",
    });
    expect(await db.dugPlants.get(later.id)).toMatchObject({ syncState: "waiting" });
    expect((await db.meta.get(PULL_META.lastMutationIds))?.value).toMatchObject({ [clientId]: 2 });
    expect((await db.meta.get(PULL_META.rejections))?.value).toHaveLength(1);
  });

  it("applies tombstones: a deleted dig goes with its plants, photos and bytes; a record with a change waiting stays", async () => {
    const device = await syncedDevice();
    const other = site({ fieldId });
    const otherPlant = plant(other.id, 1);
    await applyPull(
      db,
      (await getClientIdentity(db)).clientId,
      "c1",
      response("c2", { digSites: [serverSite(other, 10)], dugPlants: [serverPlant(otherPlant, 10)] }),
    );
    const waitingPlant = { ...otherPlant, notes: "edited offline" };
    await saveDig(db, {
      site: { ...other, accountId },
      plants: [waitingPlant],
      newPhotos: [],
      removedPlantIds: [],
      removedPhotoIds: [],
    });

    const stub = stubFetch(
      json(
        response("c3", {
          fields: [fieldRow(11, { deleted: true })],
          digSites: [serverSite(device.site, 11, true), serverSite(other, 11, true)],
          dugPlants: [serverPlant(device.plant, 11, true), serverPlant(otherPlant, 11, true)],
          photos: [serverPhoto(device.photo.meta, 11, true)],
        }),
      ),
    );
    await pull(db, { fetch: stub.fetch });
    expect(await db.fields.get(fieldId)).toBeUndefined();
    expect(await db.digSites.get(device.site.id)).toBeUndefined();
    expect(await db.dugPlants.get(device.plant.id)).toBeUndefined();
    expect(await db.photos.get(device.photo.meta.id)).toBeUndefined();
    expect(await db.photoBytes.get(device.photo.meta.id)).toBeUndefined();
    // The plant edited offline keeps its values and its dig site until the server has settled it.
    expect(await db.dugPlants.get(otherPlant.id)).toMatchObject({
      notes: "edited offline",
      syncState: "waiting",
    });
    expect(await db.digSites.get(other.id)).toBeDefined();
    expect(await db.outbox.count()).toBe(1);
  });

  it("on a reset drops the server copy but keeps the outbox and every record with a change waiting", async () => {
    const device = await syncedDevice();
    const offline = site({ fieldId });
    const offlinePlant = plant(offline.id, 1);
    const offlinePhoto = photo(offline.id, offlinePlant.id, 12);
    await saveDig(db, {
      site: { ...offline, accountId },
      plants: [offlinePlant],
      newPhotos: [offlinePhoto],
      removedPlantIds: [],
      removedPhotoIds: [],
    });
    const outbox = await db.outbox.toArray();
    expect(outbox).toHaveLength(3);

    const kept = site({ fieldId });
    const stub = stubFetch(
      json(response("fresh", { fields: [fieldRow(20)], digSites: [serverSite(kept, 20)] }, { reset: true })),
    );
    expect(await pull(db, { fetch: stub.fetch })).toEqual({ applied: true, full: true });
    expect(await db.outbox.toArray()).toEqual(outbox);
    expect(await db.digSites.get(device.site.id)).toBeUndefined();
    expect(await db.dugPlants.get(device.plant.id)).toBeUndefined();
    expect(await db.photos.get(device.photo.meta.id)).toBeUndefined();
    expect(await db.photoBytes.get(device.photo.meta.id)).toBeUndefined();
    expect(await db.digSites.get(offline.id)).toMatchObject({ syncState: "waiting" });
    expect(await db.dugPlants.get(offlinePlant.id)).toMatchObject({ syncState: "waiting" });
    expect(await db.photoBytes.get(offlinePhoto.meta.id)).toBeDefined();
    expect(await db.digSites.get(kept.id)).toMatchObject({ syncState: "synced", serverVersion: 20 });
    expect((await db.fields.toArray()).map((f) => f.version)).toEqual([20]);
    expect((await db.meta.get(PULL_META.cursor))?.value).toBe("fresh");
  });

  it("replaces the full lists (accounts, catalog, weather) on every pull", async () => {
    await syncedDevice();
    const stub = stubFetch(json(response("c2", { products: [], weather: [], accounts: [] })));
    await pull(db, { fetch: stub.fetch });
    expect(await db.products.count()).toBe(0);
    expect(await db.weather.count()).toBe(0);
    expect(await db.accounts.count()).toBe(0);
  });

  it("ignores a page asked with an older cursor than the one stored (another tab was faster)", async () => {
    await syncedDevice();
    const before = await dump(db);
    const result = await applyPull(
      db,
      (await getClientIdentity(db)).clientId,
      null,
      response("stale", { fields: [fieldRow(2, { name: "Old name" })] }),
    );
    expect(result).toEqual({ applied: false, full: false });
    expect(await dump(db)).toEqual(before);
  });

  it("a 401 changes nothing and throws SignedOutError", async () => {
    await syncedDevice();
    await saveDig(db, { site: site(), plants: [], newPhotos: [], removedPlantIds: [], removedPhotoIds: [] });
    const before = await dump(db);
    const stub = stubFetch(json({ error: "Sign in to continue." }, 401));
    await expect(pull(db, { fetch: stub.fetch })).rejects.toBeInstanceOf(SignedOutError);
    expect(await dump(db)).toEqual(before);
  });

  it("refuses a 200 that is not JSON (a sign-in page) and changes nothing", async () => {
    await syncedDevice();
    const before = await dump(db);
    const stub = stubFetch(
      () =>
        new Response("<!doctype html><title>Sign in</title><form>…</form>", {
          status: 200,
          headers: { "content-type": "text/html; charset=utf-8" },
        }),
    );
    const error = await pull(db, { fetch: stub.fetch }).then(
      () => null,
      (err: unknown) => err,
    );
    expect(error).toBeInstanceOf(SyncHttpError);
    expect((error as SyncHttpError).status).toBe(200);
    expect(await dump(db)).toEqual(before);
  });

  it("refuses JSON that is not a pull response, and reports an unsupported version as such", async () => {
    await syncedDevice();
    const before = await dump(db);
    const wrongShape = stubFetch(json({ cursor: "c9", changes: {} }));
    await expect(pull(db, { fetch: wrongShape.fetch })).rejects.toBeInstanceOf(SyncHttpError);
    const tooOld = stubFetch(json({ error: "This copy of the field app is too old to sync." }, 409));
    await expect(pull(db, { fetch: tooOld.fetch })).rejects.toThrow(
      new UnsupportedVersionError("This copy of the field app is too old to sync."),
    );
    const serverDown = stubFetch(json({ error: "The server hit an unexpected error." }, 500));
    await expect(pull(db, { fetch: serverDown.fetch })).rejects.toMatchObject({
      name: "SyncHttpError",
      status: 500,
    });
    expect(await dump(db)).toEqual(before);
  });

  it("pullNow records the last failure for the status line and clears it after a success", async () => {
    await syncedDevice();
    const s = site();
    await saveDig(db, {
      site: s,
      plants: [],
      newPhotos: [photo(s.id, null, 13)],
      removedPlantIds: [],
      removedPhotoIds: [],
    });
    const offline = (async () => {
      throw new TypeError("fetch failed");
    }) as unknown as typeof fetch;
    const now = new Date("2026-05-16T09:30:00Z");
    await expect(pullNow(db, { fetch: offline, now })).rejects.toMatchObject({
      name: "SyncHttpError",
      status: null,
    });
    const status = await syncStatus(db);
    expect(status.lastError).toEqual({
      kind: "offline",
      message: "Could not reach the server.",
      at: now.toISOString(),
    });
    expect(status.pendingMutations).toBe(2);
    expect(status.pendingPhotos).toBe(1);
    const lastPullAt = status.lastPullAt;
    expect(lastPullAt).not.toBeNull();

    await expect(
      pullNow(db, { fetch: stubFetch(json({ error: "Sign in." }, 401)).fetch }),
    ).rejects.toBeInstanceOf(SignedOutError);
    expect((await syncStatus(db)).lastError?.kind).toBe("signed-out");

    const later = new Date("2026-05-16T10:00:00Z");
    await pullNow(db, { fetch: stubFetch(json(response("c2"))).fetch, now: later });
    expect(await syncStatus(db)).toMatchObject({ lastError: null, lastPullAt: later.toISOString() });
  });
});
