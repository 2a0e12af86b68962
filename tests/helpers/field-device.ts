// A field device running the REAL client code (sync/client: saveDig, push, uploadPhotos, pull, the
// runner's cycle) on its own fake-indexeddb database, talking to the real app with a signed-in
// cookie through a fetch that can inject faults: offline, a request dropped before it is sent, an
// answer lost after the server committed, an answer held back and delivered late, the tab closed
// between the answer and the device's transaction. `snapshot()` gives assertInvariants
// (tests/helpers/sync.ts) the device's view; `expectDeviceMatchesServer` checks invariant 3 both ways.
import "fake-indexeddb/auto";
import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import { expect } from "vitest";
import type { Database } from "@/db/schema";
import { type FieldDatabase, openFieldDb } from "@/sync/client/db";
import type { FetchFn } from "@/sync/client/http";
import { getClientIdentity } from "@/sync/client/identity";
import type { PutBytes } from "@/sync/client/photos";
import { PULL_META, type PullResult, pull } from "@/sync/client/pull";
import { LAST_ACKED, type PushReport, push } from "@/sync/client/push";
import { type DigSave, saveDig } from "@/sync/client/records";
import { type CycleReport, syncOnce } from "@/sync/client/runner";
import type { Mutation } from "@/sync/protocol";
import { MERGED_FIELDS, normalize, type SyncedTable } from "@/sync/server/merge";
import type { ApiClient } from "./session";
import type { InvariantDevice, LocalRecord, OutboxEntry } from "./sync";

export type DeviceFault =
  // The request never leaves the phone.
  | "drop-before-send"
  // The server answers (it has committed); the answer is lost on the way back.
  | "drop-after-commit"
  // The answer arrives, then the tab is closed before the device's transaction: the database closes.
  | "close-after-answer";

interface QueuedFault {
  path: string;
  fault: DeviceFault;
}

interface Hold {
  path: string;
  gate: Promise<void>;
  markArrived: () => void;
}

const TABLES: Record<SyncedTable, "digSites" | "dugPlants" | "photos"> = {
  digSite: "digSites",
  dugPlant: "dugPlants",
  photo: "photos",
};

export class FieldDevice {
  db: FieldDatabase;
  readonly dbName = `trenchbook-device-${randomUUID()}`;
  offline = false;
  clockSkewMs = 0;
  // Every record id this device created, with the mutation id of the put that created it.
  readonly created = new Map<string, number>();
  readonly createdTable = new Map<string, SyncedTable>();
  // Requests that reached the server, by path.
  readonly sent: { path: string; body: unknown }[] = [];
  private faults: QueuedFault[] = [];
  private holds: Hold[] = [];
  private rewrites: {
    path: string;
    rewrite: (body: Record<string, unknown>) => Record<string, unknown>;
  }[] = [];

  constructor(
    public api: ApiClient,
    readonly label: string,
  ) {
    this.db = openFieldDb(this.dbName);
  }

  now(): Date {
    return new Date(Date.now() + this.clockSkewMs);
  }

  /** The next request to `path` (e.g. "/api/sync/push") suffers `fault`. */
  inject(path: string, fault: DeviceFault) {
    this.faults.push({ path, fault });
  }

  /** The next request to `path` is sent at once but its answer waits until release(). */
  hold(path: string): { arrived: Promise<void>; release: () => void } {
    let release!: () => void;
    let markArrived!: () => void;
    const gate = new Promise<void>((r) => {
      release = r;
    });
    const arrived = new Promise<void>((r) => {
      markArrived = r;
    });
    this.holds.push({ path, gate, markArrived });
    return { arrived, release };
  }

  /** Forgets faults and rewrites that no request has used yet. */
  clearFaults() {
    this.faults = [];
    this.rewrites = [];
  }

  /** The next request to `path` has its JSON body changed on the way (a reordering network). */
  rewriteNext(path: string, rewrite: (body: Record<string, unknown>) => Record<string, unknown>) {
    this.rewrites.push({ path, rewrite });
  }

  readonly fetch: FetchFn = async (url, init) => {
    if (this.offline) throw new TypeError("fetch failed");
    if (!url.startsWith("/")) return fetch(url, init);
    const r = this.rewrites.findIndex((x) => x.path === url);
    if (r >= 0) {
      const { rewrite } = this.rewrites.splice(r, 1)[0]!;
      init = { ...init, body: JSON.stringify(rewrite(JSON.parse(String(init?.body)))) };
    }
    const i = this.faults.findIndex((f) => f.path === url);
    const fault = i >= 0 ? this.faults.splice(i, 1)[0]!.fault : null;
    if (fault === "drop-before-send") throw new TypeError("fetch failed");
    const h = this.holds.findIndex((x) => x.path === url);
    const hold = h >= 0 ? this.holds.splice(h, 1)[0]! : null;
    this.sent.push({ path: url, body: JSON.parse(String(init?.body ?? "null")) });
    const res = await this.api.fetch(url, init).catch((err: unknown) => {
      hold?.markArrived();
      throw err;
    });
    if (fault === "drop-after-commit") {
      await res.arrayBuffer();
      throw new TypeError("socket hang up");
    }
    if (fault === "close-after-answer") {
      const body = await res.arrayBuffer();
      this.db.close();
      return new Response(body, { status: res.status, headers: res.headers });
    }
    if (hold) {
      const body = await res.arrayBuffer();
      hold.markArrived();
      await hold.gate;
      return new Response(body, { status: res.status, headers: res.headers });
    }
    return res;
  };

  /** Opens the database again (a new tab, or the app back from the background). */
  reopen() {
    if (this.db.isOpen()) this.db.close();
    this.db = openFieldDb(this.dbName);
  }

  async identity() {
    return getClientIdentity(this.db);
  }

  /** saveDig as the dig form calls it, remembering which ids it created. */
  async save(save: DigSave): Promise<void> {
    const before = new Set(await this.db.outbox.toCollection().primaryKeys());
    const known = new Set([
      ...(await this.db.digSites.toCollection().primaryKeys()),
      ...(await this.db.dugPlants.toCollection().primaryKeys()),
      ...(await this.db.photos.toCollection().primaryKeys()),
    ]);
    await saveDig(this.db, save, this.now());
    for (const e of await this.db.outbox.toArray()) {
      if (before.has(e.mutationId) || !e.name.endsWith(".put") || known.has(e.recordId)) continue;
      if (this.created.has(e.recordId)) continue;
      this.created.set(e.recordId, e.mutationId);
      this.createdTable.set(e.recordId, e.name.split(".")[0] as SyncedTable);
    }
  }

  /** Removes a whole dig as the app's delete does: the site and its children, one entry each. */
  async deleteDig(digSiteId: string): Promise<void> {
    const dig = await this.db.digSites.get(digSiteId);
    if (!dig) throw new Error(`${this.label} holds no dig ${digSiteId}`);
    const plants = await this.db.dugPlants.where("digSiteId").equals(digSiteId).primaryKeys();
    const photos = await this.db.photos.where("digSiteId").equals(digSiteId).primaryKeys();
    await saveDig(
      this.db,
      {
        site: { ...stripLocal(dig), accountId: dig.accountId } as DigSave["site"],
        plants: [],
        newPhotos: [],
        removedPlantIds: plants,
        removedPhotoIds: photos,
      },
      this.now(),
    );
    const { db } = this;
    await db.transaction("rw", [db.digSites, db.outbox, db.meta], async () => {
      const next = ((await db.meta.get("nextMutationId"))?.value as number | undefined) ?? 1;
      await db.digSites.delete(digSiteId);
      await db.outbox.add({
        mutationId: next,
        name: "digSite.delete",
        args: { id: digSiteId },
        recordId: digSiteId,
        baseVersion: dig.serverVersion,
        observedAt: this.now().toISOString(),
        schemaVersion: 1,
      });
      await db.meta.put({ key: "nextMutationId", value: next + 1 });
    });
  }

  push(options: { batchSize?: number } = {}): Promise<PushReport> {
    return push(this.db, { fetch: this.fetch, ...options });
  }

  pull(): Promise<PullResult> {
    return pull(this.db, { fetch: this.fetch as typeof fetch, now: this.now() });
  }

  /** The runner's cycle: upload photos, push (uploading a held photo), pull. */
  sync(options: { put?: PutBytes; batchSize?: number } = {}): Promise<CycleReport> {
    return syncOnce(this.db, {
      fetch: this.fetch,
      now: () => this.now(),
      photoRetryDelayMs: 50,
      ...options,
    });
  }

  /** Syncs until nothing is waiting: what "everything has synced" means for invariant 3. */
  async syncFully(options: { put?: PutBytes } = {}): Promise<void> {
    for (let i = 0; i < 5; i++) {
      await this.sync(options);
      if ((await this.db.outbox.count()) === 0) return;
    }
    throw new Error(`${this.label}: outbox still holds ${await this.db.outbox.count()} entries`);
  }

  async outboxIds(): Promise<number[]> {
    return (await this.db.outbox.orderBy("mutationId").toArray()).map((e) => e.mutationId);
  }

  /** The highest mutation id the server has told this device it settled. */
  async lastAcked(): Promise<number> {
    const { clientId } = await this.identity();
    const pushed = ((await this.db.meta.get(LAST_ACKED))?.value as number | undefined) ?? 0;
    const pulled =
      ((await this.db.meta.get(PULL_META.lastMutationIds))?.value as Record<string, number> | undefined)?.[
        clientId
      ] ?? 0;
    return Math.max(pushed, pulled);
  }

  async cursor(): Promise<string | null> {
    return ((await this.db.meta.get(PULL_META.cursor))?.value as string | null | undefined) ?? null;
  }

  /**
   * What assertInvariants reads of a device, taken from its database now: its live records (those
   * the server refused are left out, as that check expects), its outbox and what it was told.
   */
  async snapshot(): Promise<InvariantDevice> {
    const { clientId } = await this.identity();
    const local = new Map<string, LocalRecord>();
    for (const table of Object.keys(TABLES) as SyncedTable[]) {
      for (const row of await this.db[TABLES[table]].toArray()) {
        if (row.syncState === "rejected") continue;
        const values = Object.fromEntries(
          ["id", ...MERGED_FIELDS[table]].map((f) => [f, (row as unknown as Record<string, unknown>)[f]]),
        );
        local.set(row.id, { table, values, deleted: false });
      }
    }
    const outbox: OutboxEntry[] = (await this.db.outbox.orderBy("mutationId").toArray()).map((e) => ({
      mutationId: e.mutationId,
      baseVersion: e.baseVersion,
      observedAt: e.observedAt,
      mutation: { name: e.name, args: e.args } as Mutation,
    }));
    return {
      label: this.label,
      clientId: clientId as InvariantDevice["clientId"],
      lastAcked: await this.lastAcked(),
      created: this.created,
      local,
      outbox,
    };
  }

  async destroy() {
    this.db.close();
    await openFieldDb(this.dbName).delete();
  }
}

function stripLocal<T extends object>(row: T) {
  const {
    syncState: _a,
    serverVersion: _b,
    rejectionReason: _c,
    updatedLocallyAt: _d,
    rootIndex: _e,
    assessment: _f,
    ...rest
  } = row as Record<string, unknown>;
  return rest;
}

// ---------------------------------------------------------------------------------------------

export interface Scope {
  // The accounts whose digs the device's user sees (the test's own fixture accounts).
  accountIds: string[];
}

/**
 * Invariant 3, both ways: after a complete sync the device holds exactly the records the server shows
 * this user in `scope` (live digs; live plants and confirmed live photos of live digs), with the same
 * values, and nothing else apart from records the server refused (shown as refused).
 */
export async function expectDeviceMatchesServer(db: Kysely<Database>, device: FieldDevice, scope: Scope) {
  expect(await device.db.outbox.count(), `${device.label}: outbox empty`).toBe(0);
  const digs = await db
    .selectFrom("digSite")
    .selectAll()
    .where("accountId", "in", scope.accountIds)
    .where("deletedAt", "is", null)
    .execute();
  const digIds = digs.map((d) => d.id);
  const plants =
    digIds.length === 0
      ? []
      : await db
          .selectFrom("dugPlant")
          .selectAll()
          .where("digSiteId", "in", digIds)
          .where("deletedAt", "is", null)
          .execute();
  const photos =
    digIds.length === 0
      ? []
      : await db
          .selectFrom("photo")
          .selectAll()
          .where("digSiteId", "in", digIds)
          .where("deletedAt", "is", null)
          .where("confirmedAt", "is not", null)
          .execute();
  const server: Record<SyncedTable, Record<string, unknown>[]> = {
    digSite: digs as unknown as Record<string, unknown>[],
    dugPlant: plants as unknown as Record<string, unknown>[],
    photo: photos as unknown as Record<string, unknown>[],
  };
  for (const table of Object.keys(TABLES) as SyncedTable[]) {
    const localRows = (await device.db[TABLES[table]].toArray()).filter(
      (r) =>
        r.syncState !== "rejected" &&
        (table !== "digSite" || scope.accountIds.includes((r as { accountId: string }).accountId)),
    );
    const serverRows = server[table].filter(
      (r) => table === "digSite" || digIds.includes(r.digSiteId as string),
    );
    expect(localRows.map((r) => r.id).sort(), `${device.label}: ${table} ids`).toEqual(
      serverRows.map((r) => r.id as string).sort(),
    );
    const byId = new Map(localRows.map((r) => [r.id, r as unknown as Record<string, unknown>]));
    for (const row of serverRows) {
      const mine = byId.get(row.id as string)!;
      for (const f of MERGED_FIELDS[table]) {
        expect(normalize(f, mine[f]), `${device.label}: ${table}.${f} of ${row.id}`).toEqual(
          normalize(f, row[f]),
        );
      }
      expect(mine.syncState, `${device.label}: ${table} ${row.id} state`).not.toBe("waiting");
    }
  }
  if (photos.length > 0) {
    // Bytes are dropped once a pull shows the photo confirmed.
    const kept = await device.db.photoBytes.bulkGet(photos.map((p) => p.id));
    expect(kept.filter(Boolean), `${device.label}: photo bytes dropped after confirmation`).toEqual([]);
  }
}

/**
 * Invariant 2 for a real device: every id it created whose put the server applied exists on the
 * server, live or deliberately deleted (checked whether or not the device still holds it).
 */
export async function expectCreatedOnServer(db: Kysely<Database>, device: FieldDevice) {
  const { clientId } = await device.identity();
  const results = await db
    .selectFrom("syncMutationResult")
    .select(["mutationId", "status"])
    .where("clientId", "=", clientId)
    .execute();
  const applied = new Set(results.filter((r) => r.status === "applied").map((r) => r.mutationId));
  for (const [id, mutationId] of device.created) {
    if (!applied.has(mutationId)) continue;
    const table = device.createdTable.get(id)!;
    const row = await db.selectFrom(table).select("id").where("id", "=", id).executeTakeFirst();
    expect(row, `${device.label}: created ${table} ${id} is on the server`).toBeDefined();
  }
}
