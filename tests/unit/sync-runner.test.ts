import "fake-indexeddb/auto";
import { createHash, randomUUID } from "node:crypto";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { type FieldDatabase, fieldDb, openFieldDb } from "@/sync/client/db";
import { SignedOutError, SyncHttpError, UnsupportedVersionError } from "@/sync/client/errors";
import type { FetchFn } from "@/sync/client/http";
import { getClientIdentity } from "@/sync/client/identity";
import { type PutBytes, uploadPhotos } from "@/sync/client/photos";
import { LAST_ACKED, push } from "@/sync/client/push";
import { type DigSave, saveDig } from "@/sync/client/records";
import {
  backoffDelay,
  failureOf,
  type RunnerEnv,
  type SyncRunnerStatus,
  startSyncRunner,
  syncOnce,
} from "@/sync/client/runner";
import {
  type DigSitePayload,
  type DugPlantPayload,
  type PhotoPayload,
  PROTOCOL_VERSION,
  pullResponseSchema,
  SCHEMA_VERSION,
} from "@/sync/protocol";

// The device side of push, photo upload and the runner against fake-indexeddb and a small in-process
// server that follows the push contract (sync/server/push.ts): exactly-once ids, gaps refused, a
// photo row held until its object is confirmed. The same client code runs against the real app in
// tests/integration/sync-faults.test.ts and sync-property.test.ts.

const accountId = randomUUID();
const fieldId = randomUUID();

function site(over: Partial<DigSitePayload> = {}): DigSave["site"] {
  return {
    id: randomUUID(),
    fieldId,
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
    ...over,
    accountId,
  };
}

function plant(digSiteId: string, position: number): DugPlantPayload {
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
  };
}

function photo(digSiteId: string, fill: number, size = 1000) {
  const bytes = new Uint8Array(size).fill(fill).buffer;
  const meta: PhotoPayload = {
    id: randomUUID(),
    digSiteId,
    dugPlantId: null,
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

async function save(
  db: FieldDatabase,
  s: DigSave["site"],
  plants: DugPlantPayload[] = [],
  photos = [] as ReturnType<typeof photo>[],
) {
  await saveDig(db, { site: s, plants, newPhotos: photos, removedPlantIds: [], removedPhotoIds: [] });
}

interface Mutation {
  mutationId: number;
  mutation: { name: string; args: { id: string; sha256?: string } };
}

const json = (body: unknown, status = 200) =>
  new Response(JSON.stringify(body), { status, headers: { "content-type": "application/json" } });

// The push, presign, confirm and pull contracts, minimal and in memory.
class FakeServer {
  last = new Map<string, number>();
  // One entry per applied or refused mutation: exactly-once shows as no duplicates here.
  effects: string[] = [];
  stored = new Map<string, number>();
  confirmed = new Set<string>();
  photoRows = new Set<string>();
  signedOut = false;
  refuse = new Map<string, string>();
  requests: { url: string; body: Record<string, unknown> }[] = [];
  // Replaces the next push body before it is handled (a reordering network, a lost batch).
  rewriteNextPush: ((body: { mutations: Mutation[] }) => void) | null = null;
  // Runs before a push answer is sent; throwing drops the answer after the "commit".
  afterCommit: (() => void) | null = null;
  versionRefused = false;

  fetch: FetchFn = async (url, init) => {
    const body = JSON.parse(String(init?.body)) as Record<string, unknown>;
    this.requests.push({ url, body: structuredClone(body) });
    if (this.signedOut) return json({ error: "Sign in to continue." }, 401);
    if (url === "/api/sync/push") return this.push(body as never);
    if (url === "/api/sync/pull") return this.pull(body as never);
    if (url === "/api/photos/presign") {
      const sha = body.sha256 as string;
      if (this.stored.get(sha) === body.byteSize) return json({ exists: true, key: `photos/${sha}` });
      return json({
        exists: false,
        url: `http://bucket.test/photos/${sha}`,
        headers: { "content-type": "image/jpeg" },
      });
    }
    if (url === "/api/photos/confirm") {
      const sha = body.sha256 as string;
      if (this.stored.get(sha) !== body.byteSize)
        return json({ error: "The photo is not in the store yet." }, 422);
      this.confirmed.add(sha);
      return json({ confirmed: true });
    }
    return json({ error: "No such route." }, 404);
  };

  put: PutBytes = async (url, _headers, bytes, onProgress) => {
    const sha = url.split("/").pop()!;
    onProgress(bytes.byteLength / 2);
    this.stored.set(sha, bytes.byteLength);
    onProgress(bytes.byteLength);
    return 200;
  };

  private push(body: { clientId: string; schemaVersion: number; mutations: Mutation[] }) {
    if (this.versionRefused || ![SCHEMA_VERSION, SCHEMA_VERSION - 1].includes(body.schemaVersion)) {
      return json({ error: "This copy of the field app is too old to sync.", supported: {} }, 409);
    }
    this.rewriteNextPush?.(body);
    this.rewriteNextPush = null;
    const last = this.last.get(body.clientId) ?? 0;
    const fresh = body.mutations.filter((m) => m.mutationId > last);
    if (fresh[0] && fresh[0].mutationId !== last + 1) {
      return json({ error: "gap", expectedMutationId: last + 1, lastMutationId: last }, 409);
    }
    let next = last;
    const results = [];
    let heldAt: number | undefined;
    for (const m of fresh) {
      const { name, args } = m.mutation;
      if (name === "photo.put" && !this.photoRows.has(args.id) && !this.confirmed.has(args.sha256!)) {
        heldAt = m.mutationId;
        break;
      }
      if (name === "photo.put") this.photoRows.add(args.id);
      const reason = this.refuse.get(args.id);
      this.effects.push(`${body.clientId}:${m.mutationId}`);
      results.push(
        reason
          ? { mutationId: m.mutationId, status: "rejected", reason }
          : { mutationId: m.mutationId, status: "applied" },
      );
      next = m.mutationId;
    }
    this.last.set(body.clientId, next);
    this.afterCommit?.();
    return json({
      protocolVersion: PROTOCOL_VERSION,
      lastMutationId: next,
      results,
      ...(heldAt ? { heldAt, reason: "Photo not uploaded yet." } : {}),
    });
  }

  private pulls = 0;
  private pull(_body: { clientGroupId: string }) {
    return json(
      pullResponseSchema.parse({
        protocolVersion: PROTOCOL_VERSION,
        cursor: `c${++this.pulls}`,
        reset: false,
        lastMutationIds: Object.fromEntries(this.last),
        rejections: [],
        changes: {
          accounts: [],
          fields: [],
          plantings: [],
          fertilizerPasses: [],
          products: [],
          weather: [],
          digSites: [],
          dugPlants: [],
          photos: [],
        },
      }),
    );
  }
}

let db: FieldDatabase;
let dbName: string;
let server: FakeServer;

beforeEach(async () => {
  dbName = `trenchbook-runner-${randomUUID()}`;
  db = openFieldDb(dbName);
  await db.open();
  server = new FakeServer();
});

afterEach(async () => {
  vi.useRealTimers();
  db.close();
  await openFieldDb(dbName).delete();
});

const outboxIds = async (d: FieldDatabase = db) =>
  (await d.outbox.orderBy("mutationId").toArray()).map((e) => e.mutationId);

async function dump(d: FieldDatabase) {
  const out: Record<string, unknown[]> = {};
  for (const table of d.tables) out[table.name] = await table.toArray();
  return out;
}

describe("push: acknowledgement", () => {
  it("sends batches of at most 50 in id order with the versions and identity, and empties the outbox", async () => {
    for (let i = 0; i < 4; i++) {
      const s = site();
      await save(
        db,
        s,
        Array.from({ length: 29 }, (_, k) => plant(s.id, k + 1)),
      );
    }
    expect(await db.outbox.count()).toBe(120);
    const progress: number[] = [];
    const report = await push(db, {
      fetch: server.fetch,
      onProgress: (done, total) => progress.push(done / total),
    });
    const identity = await getClientIdentity(db);
    const bodies = server.requests.map((r) => r.body as { mutations: Mutation[] } & Record<string, unknown>);
    expect(bodies.map((b) => b.mutations.length)).toEqual([50, 50, 20]);
    expect(bodies.flatMap((b) => b.mutations.map((m) => m.mutationId))).toEqual(
      Array.from({ length: 120 }, (_, i) => i + 1),
    );
    for (const b of bodies) {
      expect(b).toMatchObject({
        protocolVersion: PROTOCOL_VERSION,
        schemaVersion: SCHEMA_VERSION,
        clientGroupId: identity.clientGroupId,
        clientId: identity.clientId,
      });
    }
    expect(report).toMatchObject({ acknowledged: 120, lastMutationId: 120, requests: 3, held: null });
    expect(progress.at(-1)).toBe(1);
    expect(await db.outbox.count()).toBe(0);
    expect((await db.meta.get(LAST_ACKED))?.value).toBe(120);
    expect(new Set(server.effects).size).toBe(120);
  });

  it("drops entries only up to the acknowledged id: a held photo keeps itself and everything after it", async () => {
    const s = site();
    const ph = photo(s.id, 7);
    await save(db, s, [plant(s.id, 1)], [ph]);
    const later = site();
    await save(db, later);
    expect(await outboxIds()).toEqual([1, 2, 3, 4]);

    const first = await push(db, { fetch: server.fetch });
    expect(first.held).toEqual({ mutationId: 3, photoId: ph.meta.id, reason: "Photo not uploaded yet." });
    expect(first.lastMutationId).toBe(2);
    expect(await outboxIds()).toEqual([3, 4]);
    // Held: the photo's row and the dig after it were not applied.
    expect(server.effects).toHaveLength(2);

    const uploaded = await uploadPhotos(db, { fetch: server.fetch, put: server.put, only: [ph.meta.id] });
    expect(uploaded.confirmed).toEqual([ph.meta.id]);
    expect((await db.photos.get(ph.meta.id))?.uploaded).toBe(1);
    // The bytes stay until a pull shows the photo confirmed.
    expect(await db.photoBytes.get(ph.meta.id)).toBeDefined();

    const second = await push(db, { fetch: server.fetch });
    expect(second).toMatchObject({ held: null, lastMutationId: 4, acknowledged: 2 });
    expect(await db.outbox.count()).toBe(0);
    expect(server.effects).toHaveLength(4);
  });

  it("keeps the outbox when the answer is lost after the commit, and drops the duplicates the retry confirms", async () => {
    const s = site();
    await save(db, s, [plant(s.id, 1), plant(s.id, 2)]);
    server.afterCommit = () => {
      server.afterCommit = null;
      throw new TypeError("socket hang up");
    };
    const lost = await push(db, { fetch: server.fetch }).catch((e: unknown) => e);
    expect(lost).toBeInstanceOf(SyncHttpError);
    expect((lost as SyncHttpError).status).toBeNull();
    expect(await outboxIds()).toEqual([1, 2, 3]);
    const retry = await push(db, { fetch: server.fetch });
    expect(retry.lastMutationId).toBe(3);
    expect(await db.outbox.count()).toBe(0);
    expect(server.effects).toEqual([1, 2, 3].map((m) => `${server.effects[0]!.split(":")[0]}:${m}`));
  });

  it("marks a refused record with the reason and moves on; a refused delete asks for a full pull", async () => {
    const s = site();
    const p = plant(s.id, 1);
    await save(db, s, [p]);
    server.refuse.set(p.id, "The plant number must be from 1 to 50.");
    const report = await push(db, { fetch: server.fetch });
    expect(report.rejected).toEqual([
      {
        mutationId: 2,
        name: "dugPlant.put",
        recordId: p.id,
        reason: "The plant number must be from 1 to 50.",
      },
    ]);
    expect(await db.dugPlants.get(p.id)).toMatchObject({
      syncState: "rejected",
      rejectionReason: "The plant number must be from 1 to 50.",
    });
    expect(await db.outbox.count()).toBe(0);

    await db.meta.put({ key: "cursor", value: "c9" });
    server.refuse.set(s.id, "This dig has an open injury case.");
    await saveDig(db, { site: s, plants: [], newPhotos: [], removedPlantIds: [p.id], removedPhotoIds: [] });
    await db.transaction("rw", db.digSites, db.outbox, db.meta, async () => {
      // The rep removes the whole dig (the form's delete path queues the site's delete).
      const next = ((await db.meta.get("nextMutationId"))?.value as number) ?? 1;
      await db.digSites.delete(s.id);
      await db.outbox.add({
        mutationId: next,
        name: "digSite.delete",
        args: { id: s.id },
        recordId: s.id,
        baseVersion: 3,
        observedAt: new Date().toISOString(),
        schemaVersion: SCHEMA_VERSION,
      });
      await db.meta.put({ key: "nextMutationId", value: next + 1 });
    });
    const refused = await push(db, { fetch: server.fetch });
    expect(refused.rejected.map((r) => r.name)).toContain("digSite.delete");
    expect((await db.meta.get("cursor"))?.value).toBeNull();
  });
});

describe("push: refusals keep the outbox", () => {
  it("a 401 leaves every mutation where it was and throws SignedOutError (fault 10)", async () => {
    const s = site();
    await save(db, s, [plant(s.id, 1), plant(s.id, 2)], [photo(s.id, 3)]);
    await getClientIdentity(db);
    const before = await dump(db);
    server.signedOut = true;
    await expect(push(db, { fetch: server.fetch })).rejects.toBeInstanceOf(SignedOutError);
    await expect(uploadPhotos(db, { fetch: server.fetch, put: server.put })).rejects.toBeInstanceOf(
      SignedOutError,
    );
    await expect(syncOnce(db, { fetch: server.fetch, put: server.put })).rejects.toBeInstanceOf(
      SignedOutError,
    );
    expect(await dump(db)).toEqual(before);
    expect(server.effects).toEqual([]);
  });

  it("a 200 that is not JSON (a sign-in page behind a redirect) acknowledges nothing", async () => {
    const s = site();
    await save(db, s, [plant(s.id, 1)]);
    await getClientIdentity(db);
    const before = await dump(db);
    const html: FetchFn = async () =>
      new Response("<!doctype html><title>Sign in</title>", {
        status: 200,
        headers: { "content-type": "text/html" },
      });
    const err = await push(db, { fetch: html }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(SyncHttpError);
    const wrongShape: FetchFn = async () => json({ lastMutationId: 2 });
    await expect(push(db, { fetch: wrongShape })).rejects.toBeInstanceOf(SyncHttpError);
    expect(await dump(db)).toEqual(before);
  });

  it("an unsupported version (409/426) throws UnsupportedVersionError and keeps the outbox", async () => {
    const s = site();
    await save(db, s);
    await getClientIdentity(db);
    const before = await dump(db);
    server.versionRefused = true;
    await expect(push(db, { fetch: server.fetch })).rejects.toBeInstanceOf(UnsupportedVersionError);
    const upgrade: FetchFn = async () => json({ error: "Upgrade required." }, 426);
    await expect(push(db, { fetch: upgrade })).rejects.toThrow("Upgrade required.");
    expect(await dump(db)).toEqual(before);
  });

  it("pushes an outbox written by the previous schema version in batches of their own (fault 14)", async () => {
    const s = site();
    await save(db, s, [plant(s.id, 1)]);
    await db.outbox
      .where("mutationId")
      .equals(1)
      .modify({ schemaVersion: SCHEMA_VERSION - 1 });
    await push(db, { fetch: server.fetch });
    expect(
      server.requests.map((r) => [
        r.body.schemaVersion,
        (r.body.mutations as Mutation[]).map((m) => m.mutationId),
      ]),
    ).toEqual([
      [SCHEMA_VERSION - 1, [1]],
      [SCHEMA_VERSION, [2]],
    ]);
    expect(await db.outbox.count()).toBe(0);
  });
});

describe("push: gaps", () => {
  it("resends from the id the server expects when a later batch reached it first", async () => {
    const s = site();
    await save(db, s, [plant(s.id, 1), plant(s.id, 2), plant(s.id, 3)]);
    // The network lost the first two mutations of the request.
    server.rewriteNextPush = (body) => {
      body.mutations = body.mutations.slice(2);
    };
    const report = await push(db, { fetch: server.fetch });
    const sent = server.requests.map((r) => (r.body.mutations as Mutation[]).map((m) => m.mutationId));
    expect(sent).toEqual([
      [1, 2, 3, 4],
      [1, 2, 3, 4],
    ]);
    expect(report.lastMutationId).toBe(4);
    expect(await db.outbox.count()).toBe(0);
    expect(server.effects).toHaveLength(4);
  });

  it("stops with an error, outbox intact, when the server expects an entry this phone no longer has", async () => {
    const s = site();
    await save(db, s, [plant(s.id, 1), plant(s.id, 2)]);
    await push(db, { fetch: server.fetch });
    await save(db, site());
    // The server lost its record of this client (restored from an older backup).
    server.last.clear();
    const before = await outboxIds();
    const err = await push(db, { fetch: server.fetch }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(SyncHttpError);
    expect((err as SyncHttpError).message).toMatch(/missing change 1/);
    expect(await outboxIds()).toEqual(before);
  });
});

describe("photos", () => {
  it("uploads bytes once, reports progress, and only confirms a photo the bucket already has", async () => {
    const s = site();
    const a = photo(s.id, 1, 4000);
    const b = photo(s.id, 2, 6000);
    await save(db, s, [], [a, b]);
    server.stored.set(b.meta.sha256, b.meta.byteSize);
    const progress: [number, number][] = [];
    const puts: string[] = [];
    const put: PutBytes = async (url, headers, bytes, onProgress) => {
      puts.push(url);
      return server.put(url, headers, bytes, onProgress);
    };
    const report = await uploadPhotos(db, {
      fetch: server.fetch,
      put,
      onProgress: (s1, t) => progress.push([s1, t]),
    });
    expect(report.confirmed.sort()).toEqual([a.meta.id, b.meta.id].sort());
    expect(report.alreadyStored).toEqual([b.meta.id]);
    expect(puts).toEqual([`http://bucket.test/photos/${a.meta.sha256}`]);
    expect(progress[0]).toEqual([0, 10_000]);
    expect(progress).toContainEqual([2000, 10_000]);
    expect(progress.at(-1)).toEqual([10_000, 10_000]);
    expect(progress.map(([x]) => x)).toEqual([...progress.map(([x]) => x)].sort((x, y) => x - y));
    expect((await db.photos.toArray()).every((p) => p.uploaded === 1)).toBe(true);
    // Nothing left to upload: a second run sends nothing.
    const count = server.requests.length;
    await uploadPhotos(db, { fetch: server.fetch, put });
    expect(server.requests.length).toBe(count);
  });

  it("retries a cut upload with a doubling wait and confirms it once complete", async () => {
    const s = site();
    const a = photo(s.id, 1, 4000);
    await save(db, s, [], [a]);
    let cuts = 1;
    const put: PutBytes = async (url, headers, bytes, onProgress) => {
      if (cuts-- > 0) {
        onProgress(bytes.byteLength / 2);
        throw new SyncHttpError("The photo upload was cut off.", null);
      }
      return server.put(url, headers, bytes, onProgress);
    };
    const waits: number[] = [];
    const report = await uploadPhotos(db, {
      fetch: server.fetch,
      put,
      retryDelayMs: 250,
      sleep: async (ms) => {
        waits.push(ms);
      },
    });
    expect(waits).toEqual([250]);
    expect(report.confirmed).toEqual([a.meta.id]);
    expect(server.confirmed.has(a.meta.sha256)).toBe(true);
  });

  it("throws the last failure when a photo is still not confirmed, and leaves it waiting", async () => {
    const s = site();
    const a = photo(s.id, 1);
    await save(db, s, [], [a]);
    const offline: PutBytes = async () => {
      throw new SyncHttpError("The photo upload was cut off.", null);
    };
    const waits: number[] = [];
    await expect(
      uploadPhotos(db, {
        fetch: server.fetch,
        put: offline,
        attempts: 3,
        retryDelayMs: 100,
        sleep: async (ms) => void waits.push(ms),
      }),
    ).rejects.toBeInstanceOf(SyncHttpError);
    expect(waits).toEqual([100, 200]);
    expect((await db.photos.get(a.meta.id))?.uploaded).toBe(0);
  });

  it("refuses bytes that no longer match their hash for good, and the push moves past the photo", async () => {
    const s = site();
    const a = photo(s.id, 1);
    await save(db, s, [], [a]);
    await db.photoBytes.put({ id: a.meta.id, bytes: new Uint8Array(1000).fill(9).buffer });
    const report = await uploadPhotos(db, { fetch: server.fetch, put: server.put });
    expect(report.refused).toEqual([{ photoId: a.meta.id, reason: expect.stringMatching(/damaged/) }]);
    expect(await db.photos.get(a.meta.id)).toMatchObject({ syncState: "rejected", uploaded: 0 });
    const pushed = await push(db, { fetch: server.fetch });
    expect(pushed.held).toBeNull();
    expect(pushed.abandonedPhotos).toEqual([a.meta.id]);
    expect(await db.outbox.count()).toBe(0);
    // The photo stays on the phone with its reason, not the server's "nothing to delete".
    expect((await db.photos.get(a.meta.id))?.rejectionReason).toMatch(/damaged/);
  });

  it("a photo removed before it was ever uploaded does not hold the queue", async () => {
    const s = site();
    const a = photo(s.id, 1);
    await save(db, s, [], [a]);
    await saveDig(db, {
      site: s,
      plants: [],
      newPhotos: [],
      removedPlantIds: [],
      removedPhotoIds: [a.meta.id],
    });
    const report = await push(db, { fetch: server.fetch });
    expect(report).toMatchObject({ held: null, abandonedPhotos: [a.meta.id], rejected: [] });
    expect(await db.outbox.count()).toBe(0);
  });
});

describe("syncOnce", () => {
  it("uploads, pushes, pulls; the pull drops acknowledged ids; a held photo goes back to the uploader", async () => {
    const s = site();
    const ph = photo(s.id, 4);
    await save(db, s, [plant(s.id, 1)], [ph]);
    const phases: string[] = [];
    let failFirstUpload = true;
    const put: PutBytes = async (...args) => {
      if (failFirstUpload) {
        failFirstUpload = false;
        throw new SyncHttpError("cut", null);
      }
      return server.put(...args);
    };
    const report = await syncOnce(db, {
      fetch: server.fetch,
      put,
      photoAttempts: 1,
      onPhase: (p) => {
        if (phases.at(-1) !== p) phases.push(p);
      },
    }).catch((e: unknown) => e);
    // The first upload failed: the cycle fails too, having pushed nothing of the photo.
    expect(report).toBeInstanceOf(SyncHttpError);
    expect(phases).toEqual(["uploading"]);

    phases.length = 0;
    const ok = await syncOnce(db, {
      fetch: server.fetch,
      put,
      onPhase: (p) => {
        if (phases.at(-1) !== p) phases.push(p);
      },
    });
    expect(phases).toEqual(["uploading", "pushing", "pulling"]);
    expect(ok.photosConfirmed).toBe(1);
    expect(await db.outbox.count()).toBe(0);
    expect((await db.meta.get("cursor"))?.value).toBe("c1");
  });
});

// ---- the runner --------------------------------------------------------------------------------

class FakeEnv implements RunnerEnv {
  online = true;
  visible = true;
  handlers = new Map<string, Set<() => void>>();
  constructor(readonly locks: RunnerEnv["locks"] = null) {}
  isOnline = () => this.online;
  isVisible = () => this.visible;
  listen(event: string, handler: () => void) {
    const set = this.handlers.get(event) ?? new Set();
    set.add(handler);
    this.handlers.set(event, set);
    return () => set.delete(handler);
  }
  fire(event: string) {
    for (const h of this.handlers.get(event) ?? []) h();
  }
}

// The Web Locks contract the runner relies on: one holder per name; ifAvailable hands null when held.
class FakeLocks {
  held = new Set<string>();
  request = (async (
    name: string,
    options: { ifAvailable?: boolean },
    fn: (lock: unknown) => Promise<unknown>,
  ) => {
    if (this.held.has(name)) {
      if (options.ifAvailable) return fn(null);
      throw new Error("queued lock requests are not used by the runner");
    }
    this.held.add(name);
    try {
      return await fn({ name, mode: "exclusive" });
    } finally {
      this.held.delete(name);
    }
  }) as unknown as LockManager["request"];
}

// fake-indexeddb runs on setImmediate, which fake timers leave alone: let the database work finish.
async function settle(rounds = 60) {
  for (let i = 0; i < rounds; i++) await new Promise<void>((r) => setImmediate(r));
}

describe("runner", () => {
  it("backs off exponentially with jitter after failures (capped), never while offline, and resets on success", async () => {
    vi.useFakeTimers({ toFake: ["setTimeout", "clearTimeout", "Date"] });
    vi.setSystemTime(new Date("2026-05-16T08:00:00Z"));
    await save(db, site());
    let networkUp = false;
    const pushes: number[] = [];
    const fetchFn: FetchFn = async (url, init) => {
      if (url === "/api/sync/push") pushes.push(Date.now());
      if (!networkUp) throw new TypeError("fetch failed");
      return server.fetch(url, init);
    };
    const env = new FakeEnv();
    const statuses: SyncRunnerStatus[] = [];
    const runner = startSyncRunner({
      db: () => db,
      env,
      fetch: fetchFn,
      put: server.put,
      intervalMs: 60_000,
      backoffBaseMs: 1000,
      backoffCapMs: 8000,
      random: () => 1,
      onStatus: (s) => statuses.push(s),
    });
    const t0 = Date.now();
    await settle();
    expect(pushes).toEqual([t0]);
    expect(runner.status().error).toEqual({ kind: "network", message: "Could not reach the server." });
    expect(runner.status().pendingMutations).toBe(1);

    // random = 1: the full ceiling each time: 1 s, 2 s, 4 s, 8 s, then capped at 8 s.
    let at = t0;
    for (const delay of [1000, 2000, 4000, 8000, 8000]) {
      expect(runner.status().nextAttemptAt).toBe(new Date(at + delay).toISOString());
      await vi.advanceTimersByTimeAsync(delay - 1);
      await settle();
      expect(pushes.at(-1)).toBe(at);
      await vi.advanceTimersByTimeAsync(1);
      await settle();
      at += delay;
      expect(pushes.at(-1)).toBe(at);
    }

    // Offline: the pending attempt is dropped and nothing runs, however long.
    env.online = false;
    env.fire("offline");
    const n = pushes.length;
    await vi.advanceTimersByTimeAsync(30 * 60_000);
    await settle();
    expect(pushes).toHaveLength(n);
    expect(runner.status()).toMatchObject({ online: false, nextAttemptAt: null });

    // Back online: at once, and the backoff starts again from the base.
    networkUp = true;
    env.online = true;
    env.fire("online");
    await settle();
    expect(pushes).toHaveLength(n + 1);
    expect(runner.status()).toMatchObject({ error: null, pendingMutations: 0, phase: "idle" });
    expect(runner.status().lastSuccessAt).toBe(new Date(Date.now()).toISOString());
    expect(runner.status().nextAttemptAt).toBe(new Date(Date.now() + 60_000).toISOString());
    expect(statuses.some((s) => s.phase === "pushing")).toBe(true);
    runner.stop();
  });

  it("runs on visibilitychange to visible and on syncNow, one cycle at a time", async () => {
    const env = new FakeEnv();
    let pulls = 0;
    const fetchFn: FetchFn = async (url, init) => {
      if (url === "/api/sync/pull") pulls++;
      return server.fetch(url, init);
    };
    const runner = startSyncRunner({ db: () => db, env, fetch: fetchFn, intervalMs: 60_000 });
    await settle();
    expect(pulls).toBe(1);
    env.visible = true;
    env.fire("visibilitychange");
    await settle();
    expect(pulls).toBe(2);
    // Three calls while one runs: that one and one more.
    await Promise.all([runner.syncNow(), runner.syncNow(), runner.syncNow()]);
    expect(pulls).toBe(4);
    runner.stop();
  });

  it("names each failure's kind, the first of a failure whose recording failed too", () => {
    expect(failureOf(new SignedOutError()).kind).toBe("signedOut");
    expect(failureOf(new UnsupportedVersionError("old")).kind).toBe("version");
    expect(failureOf(new SyncHttpError("down", null)).kind).toBe("network");
    expect(failureOf(new SyncHttpError("500", 500)).kind).toBe("server");
    expect(failureOf(new DOMException("full", "QuotaExceededError")).kind).toBe("storage");
    const closed = Object.assign(new Error("closed"), { name: "DatabaseClosedError" });
    expect(failureOf(new AggregateError([closed, new Error("meta")], "both")).kind).toBe("storage");
  });

  it("jitters between half and the whole of the ceiling", () => {
    expect(backoffDelay(1, 1000, 300_000, () => 0)).toBe(500);
    expect(backoffDelay(3, 1000, 300_000, () => 0.5)).toBe(3000);
    expect(backoffDelay(20, 1000, 300_000, () => 1)).toBe(300_000);
  });

  it("lets only one tab sync: the second skips while the first holds the lock", async () => {
    await save(db, site());
    const locks = new FakeLocks();
    const otherTab = openFieldDb(dbName);
    let release: () => void = () => undefined;
    const gate = new Promise<void>((r) => {
      release = r;
    });
    const calls = { a: 0, b: 0 };
    const slow: FetchFn = async (url, init) => {
      calls.a++;
      await gate;
      return server.fetch(url, init);
    };
    const counting: FetchFn = async (url, init) => {
      calls.b++;
      return server.fetch(url, init);
    };
    const a = startSyncRunner({ db: () => db, env: new FakeEnv(locks), fetch: slow });
    await settle();
    expect(calls.a).toBe(1);
    expect(locks.held.has("trenchbook-sync")).toBe(true);
    const b = startSyncRunner({ db: () => otherTab, env: new FakeEnv(locks), fetch: counting });
    await b.syncNow();
    expect(calls.b).toBe(0);
    expect(b.status().otherTab).toBe(true);
    release();
    await a.syncNow();
    expect(locks.held.size).toBe(0);
    await b.syncNow();
    expect(calls.b).toBeGreaterThan(0);
    expect(b.status().otherTab).toBe(false);
    expect(new Set(server.effects).size).toBe(server.effects.length);
    a.stop();
    b.stop();
    otherTab.close();
  });

  it("surfaces a refused record as the status error with its reason", async () => {
    const s = site();
    const p = plant(s.id, 1);
    await save(db, s, [p]);
    server.refuse.set(p.id, "The dig this record belongs to is not on the server.");
    const runner = startSyncRunner({ db: () => db, env: new FakeEnv(), fetch: server.fetch });
    await runner.syncNow();
    expect(runner.status().refused).toEqual([
      {
        table: "dugPlant",
        id: p.id,
        digSiteId: s.id,
        reason: "The dig this record belongs to is not on the server.",
      },
    ]);
    expect(runner.status().error?.kind).toBe("rejected");
    runner.stop();
  });

  it("counts a photo refused for good as refused, not as waiting", async () => {
    const s = site();
    const a = photo(s.id, 1);
    await save(db, s, [], [a]);
    await db.photoBytes.put({ id: a.meta.id, bytes: new Uint8Array(1000).fill(2).buffer });
    const runner = startSyncRunner({
      db: () => db,
      env: new FakeEnv(),
      fetch: server.fetch,
      put: server.put,
    });
    await runner.syncNow();
    expect(runner.status()).toMatchObject({ pendingPhotos: 0, pendingMutations: 0 });
    expect(runner.status().refused.map((r) => [r.table, r.id])).toEqual([["photo", a.meta.id]]);
    expect(runner.status().error?.message).toMatch(/A photo was refused/);
    runner.stop();
  });

  it("fieldDb() reopens after the database was closed by the app or by the browser", async () => {
    const first = fieldDb();
    await first.outbox.count();
    first.close();
    const second = fieldDb();
    expect(second).not.toBe(first);
    expect(await second.outbox.count()).toBe(0);
    // The browser dropped the connection (a backgrounded phone): Dexie reopens on the next use.
    (second.backendDB() as unknown as { onclose: () => void }).onclose();
    expect(second.isOpen()).toBe(false);
    expect(fieldDb()).toBe(second);
    expect(await fieldDb().outbox.count()).toBe(0);
    await fieldDb().delete();
  });
});
