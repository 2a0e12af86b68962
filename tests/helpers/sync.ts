// Simulated field devices for the sync integration tests: each has its sync identity, an outbox of
// numbered mutations, a local copy of the records it wrote or pulled and the server versions it saw,
// and talks to the real /api/sync/push and /api/sync/pull through a transport that can drop a
// request before it is sent or drop the answer after the server committed. assertInvariants checks
// the five invariants of shared/SYNC.md against PostgreSQL.
import { createHash, randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import { expect } from "vitest";
import type { Database } from "@/db/schema";
import { DEMO_PASSWORD } from "@/db/seed/demo-users";
import { hashPassword } from "@/lib/auth/password";
import {
  type DigSitePayload,
  type DugPlantPayload,
  type Mutation,
  PROTOCOL_VERSION,
  type PhotoPayload,
  type PullResponse,
  type PushResponse,
  pullResponseSchema,
  pushResponseSchema,
  SCHEMA_VERSION,
} from "@/sync/protocol";
import { MERGED_FIELDS, normalize, SQL_TABLE, type SyncedTable } from "@/sync/server/merge";
import { ApiClient } from "./session";

// ---------------------------------------------------------------------------------------------
// Transport with fault injection

export type Fault = "drop-before-send" | "drop-after-commit";

export class ConnectionDropped extends Error {
  constructor(readonly fault: Fault) {
    super(`connection dropped (${fault})`);
  }
}

/**
 * Sends through the signed-in ApiClient; queued faults apply to the next requests in order:
 * "drop-before-send" fails without the server seeing anything; "drop-after-commit" lets the server
 * answer (it has committed by then), reads the whole answer and then fails as if the connection
 * had been cut, so the device never learns the outcome.
 */
export class FaultyTransport {
  private faults: (Fault | null)[] = [];
  sent = 0;

  constructor(readonly api: ApiClient) {}

  inject(...faults: (Fault | null)[]) {
    this.faults.push(...faults);
  }

  async post(path: string, body: unknown): Promise<Response> {
    const fault = this.faults.shift() ?? null;
    if (fault === "drop-before-send") throw new ConnectionDropped(fault);
    this.sent++;
    const res = await this.api.json(path, "POST", body);
    if (fault === "drop-after-commit") {
      await res.arrayBuffer();
      throw new ConnectionDropped(fault);
    }
    return res;
  }
}

// ---------------------------------------------------------------------------------------------
// Simulated device

export interface OutboxEntry {
  mutationId: number;
  baseVersion: number | null;
  observedAt: string;
  mutation: Mutation;
}

export interface LocalRecord {
  table: SyncedTable;
  values: Record<string, unknown>;
  deleted: boolean;
}

export interface PushAnswer {
  status: number;
  body: PushResponse & { error?: string; expectedMutationId?: number; issues?: unknown[] };
}

const TABLE_OF_NAME: Record<Mutation["name"], SyncedTable> = {
  "digSite.put": "digSite",
  "digSite.delete": "digSite",
  "dugPlant.put": "dugPlant",
  "dugPlant.delete": "dugPlant",
  "photo.put": "photo",
  "photo.delete": "photo",
};

export class SimDevice {
  readonly clientGroupId: string;
  readonly clientId = randomUUID();
  nextMutationId = 1;
  outbox: OutboxEntry[] = [];
  // Highest mutation id the server acknowledged; never goes backwards (invariant 5).
  lastAcked = 0;
  cursor: string | null = null;
  readonly local = new Map<string, LocalRecord>();
  // Server version last seen per record id: the base of the next edit.
  readonly versions = new Map<string, number>();
  // Every record id this device created with a put, and the mutation that carried it.
  readonly created = new Map<string, number>();
  readonly transport: FaultyTransport;

  constructor(
    readonly api: ApiClient,
    readonly label: string,
    options: { clockSkewMs?: number; clientGroupId?: string } = {},
  ) {
    this.transport = new FaultyTransport(api);
    this.clockSkewMs = options.clockSkewMs ?? 0;
    this.clientGroupId = options.clientGroupId ?? randomUUID();
  }

  clockSkewMs: number;

  // The device clock (possibly skewed): observed-at data only.
  now(): string {
    return new Date(Date.now() + this.clockSkewMs).toISOString();
  }

  queue(mutation: Mutation, baseVersion?: number | null): OutboxEntry {
    const id = mutation.args.id;
    const entry: OutboxEntry = {
      mutationId: this.nextMutationId++,
      baseVersion: baseVersion === undefined ? (this.versions.get(id) ?? null) : baseVersion,
      observedAt: this.now(),
      mutation,
    };
    this.outbox.push(entry);
    const table = TABLE_OF_NAME[mutation.name];
    if (mutation.name.endsWith(".put")) {
      if (!this.local.has(id) && !this.created.has(id)) this.created.set(id, entry.mutationId);
      this.local.set(id, { table, values: { ...mutation.args }, deleted: false });
    } else {
      const rec = this.local.get(id);
      if (rec) rec.deleted = true;
    }
    return entry;
  }

  putDig(args: DigSitePayload, baseVersion?: number | null) {
    return this.queue({ name: "digSite.put", args }, baseVersion);
  }
  putPlant(args: DugPlantPayload, baseVersion?: number | null) {
    return this.queue({ name: "dugPlant.put", args }, baseVersion);
  }
  putPhoto(args: PhotoPayload, baseVersion?: number | null) {
    return this.queue({ name: "photo.put", args }, baseVersion);
  }
  remove(
    name: "digSite.delete" | "dugPlant.delete" | "photo.delete",
    id: string,
    baseVersion?: number | null,
  ) {
    return this.queue({ name, args: { id } }, baseVersion);
  }
  // The record as this device holds it, for an edit.
  record<T>(id: string): T {
    const rec = this.local.get(id);
    if (!rec) throw new Error(`${this.label} holds no record ${id}`);
    return { ...rec.values } as T;
  }

  pushBody(entries: OutboxEntry[] = this.outbox) {
    return {
      protocolVersion: PROTOCOL_VERSION,
      schemaVersion: SCHEMA_VERSION,
      clientGroupId: this.clientGroupId,
      clientId: this.clientId,
      mutations: entries,
    };
  }

  /** Pushes the outbox (or the given entries); on success drops acknowledged entries. */
  async push(entries: OutboxEntry[] = this.outbox): Promise<PushAnswer> {
    return this.pushRaw(this.pushBody(entries));
  }

  async pushRaw(body: unknown): Promise<PushAnswer> {
    const res = await this.transport.post("/api/sync/push", body);
    expect(res.headers.get("content-type")).toContain("application/json");
    const json = await res.json();
    if (res.status === 200) {
      const parsed = pushResponseSchema.parse(json);
      expect(
        parsed.lastMutationId,
        `${this.label}: acknowledged ids never go backwards`,
      ).toBeGreaterThanOrEqual(this.lastAcked);
      this.lastAcked = parsed.lastMutationId;
      this.outbox = this.outbox.filter((e) => e.mutationId > parsed.lastMutationId);
    }
    return { status: res.status, body: json };
  }

  /** Pulls and applies the changes to records with nothing waiting in the outbox. */
  async pull(): Promise<PullResponse> {
    const res = await this.transport.post("/api/sync/pull", {
      protocolVersion: PROTOCOL_VERSION,
      schemaVersion: SCHEMA_VERSION,
      clientGroupId: this.clientGroupId,
      cursor: this.cursor,
    });
    expect(res.status, `${this.label}: pull`).toBe(200);
    const pulled = pullResponseSchema.parse(await res.json());
    if (pulled.reset) this.local.clear();
    const waiting = new Set(this.outbox.map((e) => e.mutation.args.id));
    const apply = (table: SyncedTable, rows: { id: string; version: number; deleted: boolean }[]) => {
      for (const row of rows) {
        this.versions.set(row.id, row.version);
        if (waiting.has(row.id)) continue;
        const values = Object.fromEntries(
          ["id", ...MERGED_FIELDS[table]].map((f) => [f, (row as Record<string, unknown>)[f]]),
        );
        this.local.set(row.id, { table, values, deleted: row.deleted });
      }
    };
    apply("digSite", pulled.changes.digSites);
    apply("dugPlant", pulled.changes.dugPlants);
    apply("photo", pulled.changes.photos);
    this.cursor = pulled.cursor;
    return pulled;
  }

  /** Pushes until the outbox is empty, then pulls: a complete sync with no faults. */
  async sync(): Promise<void> {
    while (this.outbox.length > 0) {
      const answer = await this.push();
      expect(answer.status, `${this.label}: push ${JSON.stringify(answer.body)}`).toBe(200);
      if (answer.body.heldAt !== undefined)
        throw new Error(`${this.label}: push held at ${answer.body.heldAt}`);
    }
    await this.pull();
  }
}

// ---------------------------------------------------------------------------------------------
// Invariants of shared/SYNC.md, checked against PostgreSQL

const lastRegionVersions = new Map<string, number>();

// What assertInvariants reads of a device: a SimDevice, or the snapshot of a device running the
// real client code (tests/helpers/field-device.ts).
export type InvariantDevice = Pick<
  SimDevice,
  "label" | "clientId" | "lastAcked" | "created" | "local" | "outbox"
>;

export interface InvariantOptions {
  // Devices that have synced completely (outbox empty, then pulled): their local copy must equal
  // the server's view (invariant 3).
  synced?: InvariantDevice[];
  // Exact number of conflict rows expected per "recordId:field".
  conflicts?: Record<string, number>;
}

export async function assertInvariants(
  db: Kysely<Database>,
  devices: InvariantDevice[],
  options: InvariantOptions = {},
): Promise<void> {
  for (const device of devices) {
    const client = await db
      .selectFrom("syncClient")
      .select("lastMutationId")
      .where("id", "=", device.clientId)
      .executeTakeFirst();
    const last = client?.lastMutationId ?? 0;
    // 5: the server's counter is where the device was told, never behind it.
    expect(last, `${device.label}: server counter`).toBe(device.lastAcked);
    // 1: each acknowledged mutation id has exactly one recorded effect, and none beyond the counter.
    const results = await db
      .selectFrom("syncMutationResult")
      .select(["mutationId", "status"])
      .where("clientId", "=", device.clientId)
      .orderBy("mutationId")
      .execute();
    expect(
      results.map((r) => r.mutationId),
      `${device.label}: one result per mutation`,
    ).toEqual(Array.from({ length: last }, (_, i) => i + 1));
    // 2: every id this device created, once acknowledged as applied, exists (live or tombstoned).
    const appliedIds = new Set(results.filter((r) => r.status === "applied").map((r) => r.mutationId));
    for (const [id, mutationId] of device.created) {
      if (!appliedIds.has(mutationId)) continue;
      const table = device.local.get(id)?.table;
      if (!table) continue;
      const row = await db.selectFrom(table).select("id").where("id", "=", id).executeTakeFirst();
      expect(row, `${device.label}: created ${table} ${id} is on the server`).toBeDefined();
    }
  }

  // 3: a synced device holds exactly the server's view of the records it knows.
  for (const device of options.synced ?? []) {
    expect(device.outbox, `${device.label}: outbox empty`).toEqual([]);
    for (const [id, rec] of device.local) {
      const row = (await db.selectFrom(rec.table).selectAll().where("id", "=", id).executeTakeFirst()) as
        | Record<string, unknown>
        | undefined;
      if (!row) continue; // a create the server refused: the device shows it as rejected
      expect(rec.deleted, `${device.label}: ${rec.table} ${id} deleted`).toBe(row.deletedAt !== null);
      if (rec.deleted) continue;
      for (const f of MERGED_FIELDS[rec.table]) {
        expect(normalize(f, rec.values[f]), `${device.label}: ${rec.table}.${f} of ${id}`).toEqual(
          normalize(f, row[f]),
        );
      }
    }
  }

  // 4: one conflict row per pair of concurrent edits: never two for the same device value of a field
  // against the same base, and exactly the expected count where the test knows it.
  const conflicts = await db
    .selectFrom("syncConflict")
    .select(["tableName", "recordId", "fieldName", "clientUserId", "baseVersion", "clientValue"])
    .execute();
  const keys = conflicts.map((c) =>
    JSON.stringify([c.tableName, c.recordId, c.fieldName, c.clientUserId, c.baseVersion, c.clientValue]),
  );
  expect(new Set(keys).size, "no duplicate conflict rows").toBe(keys.length);
  for (const [key, count] of Object.entries(options.conflicts ?? {})) {
    const [recordId, field] = key.split(":");
    expect(
      conflicts.filter((c) => c.recordId === recordId && c.fieldName === field).length,
      `conflict rows for ${key}`,
    ).toBe(count);
  }

  // 5: region versions only grow.
  for (const cursor of await db.selectFrom("syncCursor").select(["regionId", "version"]).execute()) {
    const before = lastRegionVersions.get(cursor.regionId) ?? 0;
    expect(cursor.version, `sync cursor of region ${cursor.regionId}`).toBeGreaterThanOrEqual(before);
    lastRegionVersions.set(cursor.regionId, cursor.version);
  }
}

// ---------------------------------------------------------------------------------------------
// Fixtures: a region of its own with two reps, a supervisor and a grower, so nothing here shows up
// for the demo users (except admins) and the demo data stays as it is.

export interface SyncFixture {
  suffix: string;
  regionId: string;
  users: Record<"repA" | "repB" | "supervisor" | "grower", { id: string; email: string }>;
  // Served by repA and repB.
  shared: { accountId: string; fieldId: string; plantingId: string; secondFieldId: string };
  // Served by repB only.
  other: { accountId: string; fieldId: string };
}

export async function createSyncFixture(db: Kysely<Database>, label: string): Promise<SyncFixture> {
  const suffix = `${label}-${randomUUID().slice(0, 8)}`;
  const region = await db
    .insertInto("region")
    .values({ name: `Sync Fixture ${suffix}` })
    .returning("id")
    .executeTakeFirstOrThrow();
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const makeUser = async (key: string, role: "rep" | "supervisor" | "grower") => {
    const email = `sync-${key.toLowerCase()}-${suffix}@trenchbook.test`;
    const row = await db
      .insertInto("appUser")
      .values({
        email,
        name: `Sync ${key} ${suffix}`,
        role,
        regionId: region.id,
        passwordHash,
        status: "active",
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    return { id: row.id, email };
  };
  const users = {
    repA: await makeUser("RepA", "rep"),
    repB: await makeUser("RepB", "rep"),
    supervisor: await makeUser("Supervisor", "supervisor"),
    grower: await makeUser("Grower", "grower"),
  };
  const account = async (name: string, reps: string[], growers: string[]) => {
    const a = await db
      .insertInto("account")
      .values({ regionId: region.id, name: `${name} ${suffix}`, locality: "Fixture bench" })
      .returning("id")
      .executeTakeFirstOrThrow();
    for (const userId of reps)
      await db.insertInto("accountRep").values({ accountId: a.id, userId }).execute();
    for (const userId of growers)
      await db.insertInto("accountGrower").values({ accountId: a.id, userId }).execute();
    return a.id;
  };
  const field = async (accountId: string, name: string) =>
    (
      await db
        .insertInto("field")
        .values({ accountId, name: `${name} ${suffix}`, soilTexture: "medium" })
        .returning("id")
        .executeTakeFirstOrThrow()
    ).id;
  const sharedAccount = await account("Sync Shared Farm", [users.repA.id, users.repB.id], [users.grower.id]);
  const otherAccount = await account("Sync Other Farm", [users.repB.id], []);
  const sharedField = await field(sharedAccount, "Sync North");
  const secondField = await field(sharedAccount, "Sync South");
  const otherField = await field(otherAccount, "Sync Other");
  const plantingId = randomUUID();
  await db
    .insertInto("planting")
    .values({
      id: plantingId,
      fieldId: sharedField,
      accountId: sharedAccount,
      hybrid: "fixture 108-day",
      plantedOn: "2026-04-22",
      seedingRate: 34_000,
      seedingDepthIn: 2,
      rowSpacingIn: 30,
      soilTexture: "medium",
    })
    .execute();
  return {
    suffix,
    regionId: region.id,
    users,
    shared: { accountId: sharedAccount, fieldId: sharedField, plantingId, secondFieldId: secondField },
    other: { accountId: otherAccount, fieldId: otherField },
  };
}

export async function signIn(user: { email: string }): Promise<ApiClient> {
  const api = new ApiClient();
  const error = await api.signIn(user.email, DEMO_PASSWORD);
  if (error) throw new Error(`sign-in as ${user.email} failed: ${error}`);
  return api;
}

// ---------------------------------------------------------------------------------------------
// Payloads

export function digPayload(fieldId: string, plantingId: string | null, over: Partial<DigSitePayload> = {}) {
  return {
    id: randomUUID(),
    fieldId,
    plantingId,
    dugAt: "2026-05-14T10:20:00-07:00",
    latitude: 36.71,
    longitude: -119.62,
    accuracyM: 4,
    soilMoisture: "moist",
    soilTempF: 61,
    irrigatedYet: false,
    recommendation: null,
    flaggedByRep: false,
    notes: null,
    ...over,
  } satisfies DigSitePayload;
}

// A plant at V3 with roots on track for its stage (Iowa State "Corn Root Development" expectations
// as encoded in lib/agronomy/roots.ts): no flag of its own.
export function healthyPlant(digSiteId: string, position: number, over: Partial<DugPlantPayload> = {}) {
  return {
    id: randomUUID(),
    digSiteId,
    position,
    leafStage: "V3",
    seedingDepthIn: 2,
    crownDepthIn: 0.75,
    mesocotyl: "healthy",
    seminalScore: 5,
    nodalWhorls: 2,
    nodalCount: 10,
    longestNodalIn: 5,
    seminalInjury: "none",
    nodalInjury: "none",
    findings: [],
    bandBesideIn: null,
    bandBelowIn: null,
    notes: null,
    ...over,
  } satisfies DugPlantPayload;
}

// A plant with fertilizer burn on its roots and severe seminal injury: burn on every plant of a dig
// is a critical flag (lib/agronomy/injury.ts), which sends the dig for review.
export function burntPlant(digSiteId: string, position: number, over: Partial<DugPlantPayload> = {}) {
  return healthyPlant(digSiteId, position, {
    seminalScore: 2,
    seminalInjury: "severe",
    nodalInjury: "moderate",
    mesocotyl: "damaged",
    findings: ["band_burn"],
    ...over,
  });
}

export function photoBytes(seed: string, size = 48 * 1024): Buffer {
  // Deterministic bytes per seed, different for each seed.
  const out = Buffer.alloc(size);
  let block = createHash("sha256").update(seed).digest();
  for (let i = 0; i < size; i += block.length) {
    block.copy(out, i);
    block = createHash("sha256").update(block).digest();
  }
  return out;
}

export const sha256Hex = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

export function photoPayload(digSiteId: string, bytes: Uint8Array, over: Partial<PhotoPayload> = {}) {
  return {
    id: randomUUID(),
    digSiteId,
    dugPlantId: null,
    sha256: sha256Hex(bytes),
    byteSize: bytes.length,
    contentType: "image/jpeg",
    width: 1600,
    height: 1200,
    caption: null,
    capturedAt: "2026-05-14T10:31:00-07:00",
    ...over,
  } satisfies PhotoPayload;
}

/** Presign, PUT and confirm, as the field app does before it pushes the photo row. */
export async function uploadPhoto(
  api: ApiClient,
  photo: PhotoPayload,
  bytes: Uint8Array,
  fieldId?: string,
): Promise<{ uploaded: boolean }> {
  const presign = await api.json("/api/photos/presign", "POST", {
    photoId: photo.id,
    digSiteId: photo.digSiteId,
    fieldId: fieldId ?? null,
    sha256: photo.sha256,
    byteSize: photo.byteSize,
    contentType: photo.contentType,
  });
  expect(presign.status, "presign").toBe(200);
  const answer = (await presign.json()) as {
    exists: boolean;
    url?: string;
    headers?: Record<string, string>;
  };
  if (!answer.exists) {
    const put = await fetch(answer.url!, {
      method: "PUT",
      body: new Uint8Array(bytes),
      headers: answer.headers,
    });
    expect(put.status, "upload").toBe(200);
  }
  const confirm = await api.json("/api/photos/confirm", "POST", {
    sha256: photo.sha256,
    byteSize: photo.byteSize,
  });
  expect(confirm.status, `confirm ${await confirm.clone().text()}`).toBe(200);
  return { uploaded: !answer.exists };
}

export const sqlTable = (table: SyncedTable) => SQL_TABLE[table];
