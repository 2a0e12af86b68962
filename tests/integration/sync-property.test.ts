import "fake-indexeddb/auto";
// A seeded property test of the whole sync (shared/SYNC.md): 3–5 simulated devices, each a
// fake-indexeddb database running the REAL client code (saveDig, push, pull, the runner's cycle)
// against the real app and PostgreSQL, interleave creates, edits, added plants, deletes, going
// offline, syncs, a push or pull killed half-way, duplicate delivery, an old pull answer arriving
// after a newer one and clock skew. An in-memory model records every write, which device had seen
// which (from what each pull delivered) and what was deleted. After a final full sync of every
// device: the five invariants, every device equal to the server's view, and the model's verdicts:
// every created record on the server, every deletion standing, a field written by one device holding
// its last value, a field written by several holding one of their values, and a conflict row exactly
// where two devices changed a field without seeing each other's change.
//
// Replay a failing run: SYNC_PROPERTY_SEED=<seed> (and SYNC_PROPERTY_PATH=<path> for the shrunk
// counterexample) npm test -- tests/integration/sync-property.test.ts. More runs:
// SYNC_PROPERTY_RUNS=10000 (bench/sync-property.ts does that on its own services).
import fc from "fast-check";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { SyncHttpError } from "@/sync/client/errors";
import { PULL_META } from "@/sync/client/pull";
import { loadLocalDig } from "@/sync/client/records";
import { testEnv } from "../helpers/env";
import { expectCreatedOnServer, expectDeviceMatchesServer, FieldDevice } from "../helpers/field-device";
import type { ApiClient } from "../helpers/session";
import { assertInvariants, createSyncFixture, digPayload, healthyPlant, signIn } from "../helpers/sync";

const DAY = 86_400_000;
const RUNS = Number(testEnv.syncPropertyRuns ?? 200);
const SEED = testEnv.syncPropertySeed !== undefined ? Number(testEnv.syncPropertySeed) : Date.now() % 2 ** 31;

type Fault = "drop-before-send" | "drop-after-commit" | "close-after-answer";
type DigField = "notes" | "soilTempF" | "recommendation";

type Action =
  | { kind: "create"; d: number; plants: number }
  | { kind: "edit"; d: number; dig: number; field: DigField }
  | { kind: "editPlant"; d: number; dig: number; plant: number }
  | { kind: "addPlant"; d: number; dig: number }
  | { kind: "deletePlant"; d: number; dig: number; plant: number }
  | { kind: "delete"; d: number; dig: number }
  | { kind: "offline"; d: number }
  | { kind: "online"; d: number }
  | { kind: "sync"; d: number }
  // Every device that has signal syncs, one after another (the crew is back in range).
  | { kind: "syncAll"; d: number }
  | { kind: "kill"; d: number; fault: Fault; on: "push" | "pull" }
  | { kind: "duplicate"; d: number }
  | { kind: "reorder"; d: number }
  | { kind: "skew"; d: number; days: number };

interface Scenario {
  // Which rep each device belongs to (0: rep A, 1: rep B); 3 to 5 devices.
  owners: number[];
  actions: Action[];
}

const d = fc.nat({ max: 4 });
const pick = fc.nat({ max: 7 });
const actionArb: fc.Arbitrary<Action> = fc.oneof(
  {
    weight: 3,
    arbitrary: fc.record({ kind: fc.constant("create"), d, plants: fc.integer({ min: 0, max: 2 }) }),
  },
  {
    weight: 6,
    arbitrary: fc.record({
      kind: fc.constant("edit"),
      d,
      dig: pick,
      field: fc.constantFrom<DigField>("notes", "soilTempF", "recommendation"),
    }),
  },
  { weight: 3, arbitrary: fc.record({ kind: fc.constant("editPlant"), d, dig: pick, plant: pick }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant("addPlant"), d, dig: pick }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("deletePlant"), d, dig: pick, plant: pick }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("delete"), d, dig: pick }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("offline"), d }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("online"), d }) },
  { weight: 5, arbitrary: fc.record({ kind: fc.constant("sync"), d }) },
  { weight: 3, arbitrary: fc.record({ kind: fc.constant("syncAll"), d }) },
  {
    weight: 2,
    arbitrary: fc.record({
      kind: fc.constant("kill"),
      d,
      fault: fc.constantFrom<Fault>("drop-before-send", "drop-after-commit", "close-after-answer"),
      on: fc.constantFrom<"push" | "pull">("push", "pull"),
    }),
  },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("duplicate"), d }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("reorder"), d }) },
  {
    weight: 1,
    arbitrary: fc.record({ kind: fc.constant("skew"), d, days: fc.integer({ min: -3, max: 3 }) }),
  },
) as fc.Arbitrary<Action>;

const scenarioArb: fc.Arbitrary<Scenario> = fc.record({
  owners: fc.array(fc.nat({ max: 1 }), { minLength: 3, maxLength: 5 }),
  actions: fc.array(actionArb, { minLength: 2, maxLength: 9 }),
});

// ---- the model -----------------------------------------------------------------------------------

type Table = "digSite" | "dugPlant";

interface ModelRecord {
  id: string;
  table: Table;
  digSiteId: string;
  creator: number;
  initial: Record<string, unknown>;
  deleted: boolean;
}

interface Write {
  device: number;
  record: string;
  field: string;
  value: unknown;
  mutationId: number;
  // The step at which the writer last took the server's copy of the record (-1: never).
  baseStep: number;
  appliedAt: number | null;
}

class Model {
  readonly records = new Map<string, ModelRecord>();
  readonly digOrder: string[] = [];
  readonly plantOrder: string[] = [];
  readonly writes: Write[] = [];
  // Per device, per record: the step at which the device last took the server's copy.
  readonly refreshedAt = new Map<number, Map<string, number>>();

  refreshed(device: number, record: string): number {
    return this.refreshedAt.get(device)?.get(record) ?? -1;
  }

  // W (by its device) had seen X iff X was applied no later than W's device last refreshed the record.
  static saw(w: Write, x: Write): boolean {
    return x.appliedAt !== null && x.appliedAt <= w.baseStep;
  }

  concurrent(record: string, field: string): boolean {
    const ws = this.writes.filter((w) => w.record === record && w.field === field);
    for (const w of ws) {
      for (const x of ws) {
        if (w.device === x.device || w.value === x.value) continue;
        if (!Model.saw(w, x) && !Model.saw(x, w)) return true;
      }
    }
    return false;
  }
}

// ---- the run ---------------------------------------------------------------------------------------

let db: Kysely<Database>;
let regionId: string;
const reps: ApiClient[] = [];
const repIds: string[] = [];
let runs = 0;
let actionsRun = 0;
// What the runs exercised, printed at the end so a run that tests little shows it.
const tally = new Map<string, number>();
const count = (what: string, n = 1) => tally.set(what, (tally.get(what) ?? 0) + n);

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 4);
  const fx = await createSyncFixture(db, "property");
  regionId = fx.regionId;
  reps.push(await signIn(fx.users.repA), await signIn(fx.users.repB));
  repIds.push(fx.users.repA.id, fx.users.repB.id);
  // Each run has a farm of its own; the fixture's farms would only make every pull bigger.
  await db.deleteFrom("accountRep").where("userId", "in", repIds).execute();
});

afterAll(async () => {
  await db?.destroy();
});

async function runFarm() {
  const account = await db
    .insertInto("account")
    .values({ regionId, name: `Property farm ${runs}`, locality: "Fixture bench" })
    .returning("id")
    .executeTakeFirstOrThrow();
  for (const userId of repIds)
    await db.insertInto("accountRep").values({ accountId: account.id, userId }).execute();
  const field = await db
    .insertInto("field")
    .values({ accountId: account.id, name: `Property field ${runs}`, soilTexture: "medium" })
    .returning("id")
    .executeTakeFirstOrThrow();
  return { accountId: account.id, fieldId: field.id };
}

// Offline or under an injected fault: the network failed, or the tab closed under the device's
// transaction (and maybe under the recording of that failure too).
const isExpectedFailure = (err: unknown): boolean =>
  err instanceof SyncHttpError ||
  (err as { name?: string }).name === "DatabaseClosedError" ||
  (err instanceof AggregateError && err.errors.every(isExpectedFailure));

async function runScenario(scenario: Scenario): Promise<void> {
  runs++;
  const farm = await runFarm();
  const model = new Model();
  const devices = scenario.owners.map(
    (owner, i) => new FieldDevice(reps[owner]!, `device ${i} (rep ${"AB"[owner]})`),
  );
  const dev = (i: number) => i % devices.length;
  let step = 0;

  const localDigs = async (i: number) => {
    const held = new Set(await devices[i]!.db.digSites.toCollection().primaryKeys());
    return model.digOrder.filter((id) => held.has(id));
  };
  const localPlants = async (i: number, digId: string) => {
    const held = new Set(await devices[i]!.db.dugPlants.where("digSiteId").equals(digId).primaryKeys());
    return model.plantOrder.filter((id) => held.has(id));
  };
  const lastPullAt = async (i: number) => (await devices[i]!.db.meta.get(PULL_META.lastPullAt))?.value;

  // Writes saved by device i since outbox id `from`: record each changed field as a write.
  const recordWrites = async (i: number, from: number, fields: Record<string, Record<string, unknown>>) => {
    for (const e of await devices[i]!.db.outbox.where("mutationId").aboveOrEqual(from).toArray()) {
      for (const [field, value] of Object.entries(fields[e.recordId] ?? {})) {
        model.writes.push({
          device: i,
          record: e.recordId,
          field,
          value,
          mutationId: e.mutationId,
          baseStep: model.refreshed(i, e.recordId),
          appliedAt: null,
        });
      }
    }
  };
  const nextId = async (i: number) =>
    ((await devices[i]!.db.meta.get("nextMutationId"))?.value as number | undefined) ?? 1;

  // A sync attempt; failures are expected only offline or under an injected fault.
  const attempt = async (i: number, expectFailure: boolean, run: () => Promise<unknown>) => {
    const device = devices[i]!;
    try {
      await run();
    } catch (err) {
      if (!(device.offline || expectFailure) || !isExpectedFailure(err)) throw err;
      if (!device.db.isOpen() && device.db.hasBeenClosed()) device.reopen();
    }
  };

  // After device i acted: which of its writes the server applied, and what its pulls showed it.
  const observe = async (i: number, pulledBefore: unknown) => {
    const device = devices[i]!;
    const { clientId } = await device.identity();
    const row = await db
      .selectFrom("syncClient")
      .select("lastMutationId")
      .where("id", "=", clientId)
      .executeTakeFirst();
    const last = row?.lastMutationId ?? 0;
    for (const w of model.writes) {
      if (w.device === i && w.appliedAt === null && w.mutationId <= last) w.appliedAt = step;
    }
    if ((await lastPullAt(i)) !== pulledBefore) {
      const pending = new Set((await device.db.outbox.toArray()).map((e) => e.recordId));
      const seen = model.refreshedAt.get(i) ?? new Map<string, number>();
      for (const id of model.records.keys()) if (!pending.has(id)) seen.set(id, step);
      model.refreshedAt.set(i, seen);
    }
  };

  try {
    // Every run starts from one dig with a plant that every device holds, so their edits can meet.
    const start: Action[] = [
      { kind: "create", d: 0, plants: 1 },
      ...devices.map((_, k): Action => ({ kind: "sync", d: k })),
    ];
    for (const action of [...start, ...scenario.actions]) {
      step++;
      actionsRun++;
      const i = dev(action.d);
      const device = devices[i]!;
      const pulledBefore = await lastPullAt(i);
      switch (action.kind) {
        case "create": {
          const site = { ...digPayload(farm.fieldId, null), accountId: farm.accountId };
          const plants = Array.from({ length: action.plants }, (_, k) => healthyPlant(site.id, k + 1));
          await device.save({ site, plants, newPhotos: [], removedPlantIds: [], removedPhotoIds: [] });
          model.records.set(site.id, {
            id: site.id,
            table: "digSite",
            digSiteId: site.id,
            creator: i,
            initial: site,
            deleted: false,
          });
          model.digOrder.push(site.id);
          for (const p of plants) {
            model.records.set(p.id, {
              id: p.id,
              table: "dugPlant",
              digSiteId: site.id,
              creator: i,
              initial: p,
              deleted: false,
            });
            model.plantOrder.push(p.id);
          }
          break;
        }
        case "edit":
        case "editPlant":
        case "addPlant":
        case "deletePlant": {
          const digs = await localDigs(i);
          if (digs.length === 0) break;
          const digId = digs[action.dig % digs.length]!;
          const dig = (await loadLocalDig(device.db, digId))!;
          const from = await nextId(i);
          if (action.kind === "edit") {
            const value =
              action.field === "soilTempF" ? 20 + step : `${action.field} ${step} from device ${i}`;
            await device.save({
              site: { ...dig.site, [action.field]: value },
              plants: dig.plants,
              newPhotos: [],
              removedPlantIds: [],
              removedPhotoIds: [],
            });
            await recordWrites(i, from, { [digId]: { [action.field]: value } });
            break;
          }
          const plants = await localPlants(i, digId);
          if (action.kind === "addPlant") {
            const position = Math.min(50, Math.max(0, ...dig.plants.map((p) => p.position)) + 1);
            const plant = healthyPlant(digId, position);
            await device.save({
              site: dig.site,
              plants: [...dig.plants, plant],
              newPhotos: [],
              removedPlantIds: [],
              removedPhotoIds: [],
            });
            model.records.set(plant.id, {
              id: plant.id,
              table: "dugPlant",
              digSiteId: digId,
              creator: i,
              initial: plant,
              deleted: false,
            });
            model.plantOrder.push(plant.id);
            break;
          }
          if (plants.length === 0) break;
          const plantId = plants[action.plant % plants.length]!;
          if (action.kind === "editPlant") {
            const value = 20 + step;
            await device.save({
              site: dig.site,
              plants: dig.plants.map((p) => (p.id === plantId ? { ...p, nodalCount: value } : p)),
              newPhotos: [],
              removedPlantIds: [],
              removedPhotoIds: [],
            });
            await recordWrites(i, from, { [plantId]: { nodalCount: value } });
          } else {
            await device.save({
              site: dig.site,
              plants: dig.plants.filter((p) => p.id !== plantId),
              newPhotos: [],
              removedPlantIds: [plantId],
              removedPhotoIds: [],
            });
            model.records.get(plantId)!.deleted = true;
          }
          break;
        }
        case "delete": {
          const digs = await localDigs(i);
          if (digs.length === 0) break;
          const digId = digs[action.dig % digs.length]!;
          for (const p of await localPlants(i, digId)) model.records.get(p)!.deleted = true;
          await device.deleteDig(digId);
          model.records.get(digId)!.deleted = true;
          break;
        }
        case "offline":
          device.offline = true;
          break;
        case "online":
          device.offline = false;
          break;
        case "sync":
          await attempt(i, false, () => device.sync({ batchSize: 3 }));
          break;
        case "syncAll":
          for (const [k, other] of devices.entries()) {
            // One step per device: a device that pulled before another pushed has not seen that push.
            step++;
            const before = await lastPullAt(k);
            await attempt(k, false, () => other.sync({ batchSize: 3 }));
            await observe(k, before);
          }
          break;
        case "kill":
          device.inject(action.on === "push" ? "/api/sync/push" : "/api/sync/pull", action.fault);
          await attempt(i, true, () => device.sync({ batchSize: 3 }));
          device.clearFaults();
          break;
        case "duplicate": {
          const last = device.sent.filter((s) => s.path === "/api/sync/push").at(-1);
          if (!last || device.offline) break;
          const res = await device.api.json("/api/sync/push", "POST", last.body);
          expect(res.status, "a duplicate delivery is answered").toBe(200);
          break;
        }
        case "reorder": {
          if (device.offline) break;
          const slow = device.hold("/api/sync/pull");
          const older = device.pull();
          await slow.arrived;
          await attempt(i, false, () => device.sync({ batchSize: 3 }));
          const cursor = await device.cursor();
          slow.release();
          expect(await older, "an old pull answer is never applied over a newer one").toEqual({
            applied: false,
            full: false,
          });
          expect(await device.cursor()).toBe(cursor);
          break;
        }
        case "skew":
          device.clockSkewMs = action.days * DAY;
          break;
      }
      // syncAll observed each device as it went.
      if (action.kind !== "syncAll") await observe(i, pulledBefore);
      count(action.kind);
    }

    // Everything syncs: every device pushes all it holds, then every device pulls what the others sent.
    for (const [i, device] of devices.entries()) {
      step++;
      device.offline = false;
      device.clearFaults();
      const before = await lastPullAt(i);
      await device.syncFully();
      await observe(i, before);
    }
    for (const [i, device] of devices.entries()) {
      step++;
      const before = await lastPullAt(i);
      await device.pull();
      await observe(i, before);
    }

    await verify(model, devices, farm.accountId);
  } finally {
    await db.deleteFrom("accountRep").where("accountId", "=", farm.accountId).execute();
    for (const device of devices) await device.destroy();
  }
}

async function verify(model: Model, devices: FieldDevice[], accountId: string) {
  const snaps = await Promise.all(devices.map((dv) => dv.snapshot()));
  await assertInvariants(db, snaps, { synced: snaps });
  for (const device of devices) {
    await expectCreatedOnServer(db, device);
    await expectDeviceMatchesServer(db, device, { accountIds: [accountId] });
  }
  const clientIds = snaps.map((s) => s.clientId);
  const refused = await db
    .selectFrom("syncMutationResult")
    .select(["mutationId", "name", "reason"])
    .where("clientId", "in", clientIds)
    .where("status", "=", "rejected")
    .execute();
  expect(refused, "nothing in these scenarios is refused").toEqual([]);

  const ids = [...model.records.keys()];
  const digs = await db.selectFrom("digSite").selectAll().where("id", "in", ids).execute();
  const plants = await db.selectFrom("dugPlant").selectAll().where("id", "in", ids).execute();
  const stored = new Map<string, Record<string, unknown>>(
    [...digs, ...plants].map((r) => [r.id, r as unknown as Record<string, unknown>]),
  );
  const conflicts = await db
    .selectFrom("syncConflict")
    .select(["recordId", "fieldName"])
    .where("recordId", "in", ids)
    .execute();

  count("records checked", model.records.size);
  count("deletions checked", [...model.records.values()].filter((r) => r.deleted).length);
  for (const rec of model.records.values()) {
    const row = stored.get(rec.id);
    expect(row, `${rec.table} ${rec.id} is on the server`).toBeDefined();
    if (rec.deleted) {
      expect(row!.deletedAt, `${rec.table} ${rec.id}: its deletion stands`).not.toBeNull();
      continue;
    }
    if (model.records.get(rec.digSiteId)!.deleted) continue;
    expect(row!.deletedAt, `${rec.table} ${rec.id} is live`).toBeNull();
    const fields = rec.table === "digSite" ? ["notes", "soilTempF", "recommendation"] : ["nodalCount"];
    for (const field of fields) {
      const writes = model.writes.filter((w) => w.record === rec.id && w.field === field);
      const writers = new Set(writes.map((w) => w.device));
      const value = row![field];
      const label = `${rec.table}.${field} of ${rec.id}`;
      if (writers.size === 0) expect(value, label).toEqual(rec.initial[field]);
      else if (writers.size === 1) {
        expect(value, `${label}: its one writer's last value`).toEqual(
          [...writes].sort((a, b) => a.mutationId - b.mutationId).at(-1)!.value,
        );
      } else expect([rec.initial[field], ...writes.map((w) => w.value)], label).toContainEqual(value);
      const rows = conflicts.filter((c) => c.recordId === rec.id && c.fieldName === field).length;
      if (writers.size > 1) count("fields written by several devices");
      if (rows > 0) count("conflict rows checked", rows);
      if (model.concurrent(rec.id, field)) {
        count("fields edited concurrently");
        expect(rows, `${label}: concurrent edits leave a conflict row`).toBeGreaterThan(0);
      } else expect(rows, `${label}: no conflict row without concurrent edits`).toBe(0);
    }
  }
}

describe("sync property (seeded)", () => {
  it(
    `${RUNS} runs of 3–5 devices interleaving edits, deletes, faults and skew end with every device equal to the server`,
    async () => {
      console.log(
        `sync-property: seed=${SEED} runs=${RUNS}${testEnv.syncPropertyPath ? ` path=${testEnv.syncPropertyPath}` : ""} (replay: SYNC_PROPERTY_SEED=${SEED})`,
      );
      const started = performance.now();
      await fc.assert(
        fc.asyncProperty(scenarioArb, (scenario) => runScenario(scenario)),
        {
          seed: SEED,
          numRuns: RUNS,
          ...(testEnv.syncPropertyPath ? { path: testEnv.syncPropertyPath } : {}),
        },
      );
      const seconds = (performance.now() - started) / 1000;
      console.log(`sync-property: exercised ${[...tally].map(([k, n]) => `${k} ${n}`).join(", ")}`);
      console.log(
        `sync-property: ${runs} runs, ${actionsRun} actions in ${seconds.toFixed(1)} s: ${(runs / seconds).toFixed(2)} runs/s, ${(actionsRun / seconds).toFixed(1)} actions/s`,
      );
    },
    60 * 60_000,
  );
});
