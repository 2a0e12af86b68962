import "server-only";
import { createHash } from "node:crypto";
import { type SqlBool, sql, type Transaction } from "kysely";
import { z } from "zod";
import { db } from "@/db/client";
import { accountVisibleTo } from "@/db/queries/access";
import type { Database } from "@/db/schema";
import type { Actor } from "@/lib/auth/permissions";
import { PHOTO_TYPES, PROTOCOL_VERSION, type PullResponse, SCHEMA_VERSION } from "../protocol";

// The read side of sync (shared/SYNC.md, "Pull"): what changed since the device's cursor, within what
// the signed-in user may see, read in one snapshot together with the new cursor.
//
// Why no row is ever skipped. A versioned row (field, planting, fertilizer pass, dig site, dug plant,
// photo) carries the version its writer took from its region's sync_cursor row through
// db/queries/versioning.ts `nextVersion`, which updates that row under a row lock held until the
// writer's transaction ends. So the writer of version k+1 could only take it after the writer of k had
// committed (had it rolled back, k would have been handed out again): versions of a region become
// visible in the order they were taken, with no gaps. The pull reads the cursor rows and the changed
// rows in ONE repeatable-read snapshot; if that snapshot shows the cursor at V, the writer of V
// committed before it, hence so did every writer of a smaller version, and all rows with versions
// <= V are in the snapshot while none above V can be. Answering the rows with version > the device's
// value and handing back V therefore never skips a row committed "late"
// (tests/integration/sync-pull.test.ts proves it with two overlapping writers).
// Confirming a photo or deleting a row must take a new version the same way, or deltas miss it.
//
// Accounts, the product catalog and weather days have no per-region version: they are small and go
// in full on every pull; the device replaces its copy of them.

// How long tombstones are kept; a purge may drop a tombstone once it is older than this.
export const TOMBSTONE_RETENTION_DAYS = 30;
// A cursor is honoured for a day less than the retention, so a delete committed while a pull was
// being answered (deleted_at is the writer's start time) is still there for the next delta.
export const CURSOR_MAX_AGE_MS = (TOMBSTONE_RETENTION_DAYS - 1) * 24 * 3_600_000;

const cursorSchema = z.object({
  // Format of the cursor itself.
  f: z.literal(1),
  // User and a digest of the account ids they saw: a cursor of another user or an older scope resets.
  u: z.string(),
  s: z.string(),
  // When the server issued it (server clock, ms since the epoch).
  t: z.number().int().nonnegative(),
  // Per region the user sees, the version the device has been sent up to.
  r: z.record(z.string(), z.number().int().nonnegative()),
});
export type PullCursor = z.infer<typeof cursorSchema>;

export function encodeCursor(cursor: PullCursor): string {
  return Buffer.from(JSON.stringify(cursor), "utf8").toString("base64url");
}

// Null when the text is not a cursor this server issued in this format.
export function decodeCursor(text: string): PullCursor | null {
  let json: unknown;
  try {
    json = JSON.parse(Buffer.from(text, "base64url").toString("utf8"));
  } catch {
    return null;
  }
  const parsed = cursorSchema.safeParse(json);
  return parsed.success ? parsed.data : null;
}

export type VersionCheck = { ok: true } | { ok: false; error: string };

// The server speaks the current protocol and accepts the current and the previous record schema.
export function checkVersions(protocolVersion: number, schemaVersion: number): VersionCheck {
  if (protocolVersion === PROTOCOL_VERSION && [SCHEMA_VERSION, SCHEMA_VERSION - 1].includes(schemaVersion)) {
    return { ok: true };
  }
  const older = protocolVersion < PROTOCOL_VERSION || schemaVersion < SCHEMA_VERSION - 1;
  return {
    ok: false,
    error: older
      ? `This copy of the field app (sync protocol ${protocolVersion}, schema ${schemaVersion}) is too old to sync. Reload the app to update it; everything waiting on this device is kept.`
      : `This copy of the field app (sync protocol ${protocolVersion}, schema ${schemaVersion}) is newer than the server (protocol ${PROTOCOL_VERSION}, schema ${SCHEMA_VERSION}). Try again after the server is updated; everything waiting on this device is kept.`,
  };
}

// Registers the client group to the user on its first use. False when it belongs to someone else.
export async function claimClientGroup(clientGroupId: string, userId: string): Promise<boolean> {
  await db
    .insertInto("syncClientGroup")
    .values({ id: clientGroupId, userId })
    .onConflict((oc) => oc.column("id").doNothing())
    .execute();
  const group = await db
    .selectFrom("syncClientGroup")
    .select("userId")
    .where("id", "=", clientGroupId)
    .executeTakeFirstOrThrow();
  return group.userId === userId;
}

type Trx = Transaction<Database>;
type Changes = PullResponse["changes"];

const iso = (d: Date) => d.toISOString();

function scopeDigest(actor: Actor, accountIds: string[]): string {
  return createHash("sha256")
    .update(`${actor.id}|${actor.role}|${[...accountIds].sort().join(",")}`)
    .digest("base64url")
    .slice(0, 22);
}

async function readCursorVersions(trx: Trx, regionIds: string[]): Promise<Record<string, number>> {
  const versions: Record<string, number> = Object.fromEntries(regionIds.map((r) => [r, 0]));
  if (regionIds.length === 0) return versions;
  const rows = await trx
    .selectFrom("syncCursor")
    .select(["regionId", "version"])
    .where("regionId", "in", regionIds)
    .execute();
  for (const row of rows) versions[row.regionId] = row.version;
  return versions;
}

/**
 * One page of changes for `actor`: a full snapshot of live rows when `cursorText` is null (first pull)
 * or cannot be honoured (reset), else the rows whose version is above the cursor's for their region,
 * tombstones included. Read-only and idempotent: the same cursor against the same data gives the same
 * answer.
 */
export async function pullChanges(
  actor: Actor,
  clientGroupId: string,
  cursorText: string | null,
  now = Date.now(),
): Promise<PullResponse> {
  return db
    .transaction()
    .setIsolationLevel("repeatable read")
    .setAccessMode("read only")
    .execute(async (trx) => {
      const accounts = await trx
        .selectFrom("account")
        .select(["account.id", "account.name", "account.locality", "account.regionId"])
        .where(accountVisibleTo(actor))
        .orderBy("account.name")
        .orderBy("account.id")
        .execute();
      const accountIds = accounts.map((a) => a.id);
      const regionIds = [...new Set(accounts.map((a) => a.regionId))].sort();
      const versions = await readCursorVersions(trx, regionIds);
      const scope = scopeDigest(actor, accountIds);

      const previous = cursorText === null ? null : decodeCursor(cursorText);
      const reset =
        cursorText !== null &&
        (previous === null ||
          previous.u !== actor.id ||
          previous.s !== scope ||
          now - previous.t > CURSOR_MAX_AGE_MS ||
          Object.keys(previous.r).sort().join() !== regionIds.join() ||
          // A cursor ahead of the server (a restored database) would otherwise go backwards.
          regionIds.some((r) => (previous.r[r] ?? 0) > (versions[r] ?? 0)));
      const since = previous && !reset ? previous.r : null;

      const changes = await readChanges(trx, actor, accounts, since);
      const clients = await trx
        .selectFrom("syncClient")
        .select(["id", "lastMutationId"])
        .where("clientGroupId", "=", clientGroupId)
        .execute();
      const rejections = await trx
        .selectFrom("syncMutationResult")
        .innerJoin("syncClient", "syncClient.id", "syncMutationResult.clientId")
        .select([
          "syncMutationResult.clientId",
          "syncMutationResult.mutationId",
          "syncMutationResult.name",
          "syncMutationResult.reason",
        ])
        .where("syncClient.clientGroupId", "=", clientGroupId)
        .where("syncMutationResult.status", "=", "rejected")
        .orderBy("syncMutationResult.clientId")
        .orderBy("syncMutationResult.mutationId")
        .execute();

      return {
        protocolVersion: PROTOCOL_VERSION,
        cursor: encodeCursor({ f: 1, u: actor.id, s: scope, t: now, r: versions }),
        reset,
        lastMutationIds: Object.fromEntries(clients.map((c) => [c.id, c.lastMutationId])),
        rejections: rejections.map((r) => ({
          clientId: r.clientId,
          mutationId: r.mutationId,
          name: r.name,
          reason: r.reason ?? "Refused by the server.",
        })),
        changes,
      };
    });
}

async function readChanges(
  trx: Trx,
  actor: Actor,
  accounts: { id: string; name: string; locality: string | null; regionId: string }[],
  since: Record<string, number> | null,
): Promise<Changes> {
  // The device's version for the row's region, as a SQL value (0 for a region it has not seen).
  const sinceJson = JSON.stringify(since ?? {});
  // On a delta: rows changed after the cursor, tombstones included; on a full snapshot: live rows.
  const changed = (table: "field" | "planting" | "fertilizerPass" | "digSite" | "dugPlant" | "photo") =>
    since
      ? sql<SqlBool>`${sql.ref(`${table}.version`)} > coalesce((${sinceJson}::jsonb ->> ${sql.ref("account.regionId")}::text)::bigint, 0)`
      : sql<SqlBool>`${sql.ref(`${table}.deletedAt`)} is null`;
  const visible = accountVisibleTo(actor);

  const fields = await trx
    .selectFrom("field")
    .innerJoin("account", "account.id", "field.accountId")
    .select([
      "field.id",
      "field.accountId",
      "field.name",
      "field.boundary",
      "field.areaAcres",
      "field.centroidLat",
      "field.centroidLon",
      "field.irrigation",
      "field.soilTexture",
      "field.weatherStationId",
      "field.firstIrrigationOn",
      "field.version",
      "field.deletedAt",
    ])
    .where(visible)
    .where(changed("field"))
    .orderBy("field.id")
    .execute();

  const plantings = await trx
    .selectFrom("planting")
    .innerJoin("account", "account.id", "planting.accountId")
    .select([
      "planting.id",
      "planting.fieldId",
      "planting.accountId",
      "planting.hybrid",
      "planting.plantedOn",
      "planting.seedingRate",
      "planting.seedingDepthIn",
      "planting.rowSpacingIn",
      "planting.soilTexture",
      "planting.version",
      "planting.deletedAt",
    ])
    .where(visible)
    .where(changed("planting"))
    .orderBy("planting.id")
    .execute();

  const passes = await trx
    .selectFrom("fertilizerPass")
    .innerJoin("account", "account.id", "fertilizerPass.accountId")
    .select([
      "fertilizerPass.id",
      "fertilizerPass.fieldId",
      "fertilizerPass.plantingId",
      "fertilizerPass.productId",
      "fertilizerPass.appliedOn",
      "fertilizerPass.rate",
      "fertilizerPass.rateUnit",
      "fertilizerPass.placement",
      "fertilizerPass.intendedBesideIn",
      "fertilizerPass.intendedBelowIn",
      "fertilizerPass.version",
      "fertilizerPass.deletedAt",
    ])
    .where(visible)
    .where(changed("fertilizerPass"))
    .orderBy("fertilizerPass.id")
    .execute();

  const digSites = await trx
    .selectFrom("digSite")
    .innerJoin("account", "account.id", "digSite.accountId")
    .select([
      "digSite.id",
      "digSite.fieldId",
      "digSite.plantingId",
      "digSite.accountId",
      "digSite.repId",
      "digSite.dugAt",
      "digSite.latitude",
      "digSite.longitude",
      "digSite.accuracyM",
      "digSite.soilMoisture",
      "digSite.soilTempF",
      "digSite.irrigatedYet",
      "digSite.recommendation",
      "digSite.flaggedByRep",
      "digSite.notes",
      "digSite.rootIndex",
      "digSite.assessment",
      "digSite.version",
      "digSite.deletedAt",
    ])
    .where(visible)
    .where(changed("digSite"))
    .orderBy("digSite.id")
    .execute();

  const dugPlants = await trx
    .selectFrom("dugPlant")
    .innerJoin("digSite", "digSite.id", "dugPlant.digSiteId")
    .innerJoin("account", "account.id", "digSite.accountId")
    .select([
      "dugPlant.id",
      "dugPlant.digSiteId",
      "dugPlant.position",
      "dugPlant.leafStage",
      "dugPlant.seedingDepthIn",
      "dugPlant.crownDepthIn",
      "dugPlant.mesocotyl",
      "dugPlant.seminalScore",
      "dugPlant.nodalWhorls",
      "dugPlant.nodalCount",
      "dugPlant.longestNodalIn",
      "dugPlant.seminalInjury",
      "dugPlant.nodalInjury",
      "dugPlant.findings",
      "dugPlant.bandBesideIn",
      "dugPlant.bandBelowIn",
      "dugPlant.notes",
      "dugPlant.rootIndex",
      "dugPlant.version",
      "dugPlant.deletedAt",
    ])
    .where(visible)
    .where(changed("dugPlant"))
    // A live plant or photo of a deleted dig never reaches a device (it would be orphaned there).
    .where((eb) => eb.or([eb("dugPlant.deletedAt", "is not", null), eb("digSite.deletedAt", "is", null)]))
    .orderBy("dugPlant.id")
    .execute();

  // Only photos the bucket is known to hold (confirmed) reach devices, and only in the types the
  // protocol carries (the demo seed's drawn illustrations are SVG and stay on the office side).
  // Tombstones go out whether or not the photo was ever confirmed.
  const photos = await trx
    .selectFrom("photo")
    .innerJoin("digSite", "digSite.id", "photo.digSiteId")
    .innerJoin("account", "account.id", "digSite.accountId")
    .select([
      "photo.id",
      "photo.digSiteId",
      "photo.dugPlantId",
      "photo.sha256",
      "photo.byteSize",
      "photo.contentType",
      "photo.width",
      "photo.height",
      "photo.caption",
      "photo.capturedAt",
      "photo.confirmedAt",
      "photo.version",
      "photo.deletedAt",
    ])
    .where(visible)
    .where(changed("photo"))
    .where((eb) => eb.or([eb("photo.deletedAt", "is not", null), eb("digSite.deletedAt", "is", null)]))
    .where("photo.contentType", "in", [...PHOTO_TYPES])
    .where((eb) => eb.or([eb("photo.confirmedAt", "is not", null), eb("photo.deletedAt", "is not", null)]))
    .orderBy("photo.id")
    .execute();

  const products = await trx
    .selectFrom("product")
    .select([
      "id",
      "name",
      "chemistry",
      "form",
      "gradeN",
      "gradeP2o5",
      "gradeK2o",
      "gradeS",
      "lbPerGal",
      "densitySource",
      "saltIndex",
      "saltIndexSource",
      "containsUrea",
      "containsThiosulfate",
    ])
    .where("active", "=", true)
    .orderBy("name")
    .execute();

  // Daily temperatures of the stations the user's live fields use.
  const weather = await trx
    .selectFrom("weatherDaily")
    .select(["stationId", "day", "maxF", "minF"])
    .where("stationId", "in", (eb) =>
      eb
        .selectFrom("field")
        .innerJoin("account", "account.id", "field.accountId")
        .select("field.weatherStationId")
        .where(visible)
        .where("field.deletedAt", "is", null),
    )
    .orderBy("stationId")
    .orderBy("day")
    .execute();

  const deleted = (at: Date | null) => at !== null;
  return {
    accounts: accounts.map((a) => ({ id: a.id, name: a.name, locality: a.locality, regionId: a.regionId })),
    fields: fields.map(({ deletedAt, ...f }) => ({ ...f, deleted: deleted(deletedAt) })),
    plantings: plantings.map(({ deletedAt, ...p }) => ({ ...p, deleted: deleted(deletedAt) })),
    fertilizerPasses: passes.map(({ deletedAt, ...p }) => ({ ...p, deleted: deleted(deletedAt) })),
    products: products.map((p) => ({
      id: p.id,
      name: p.name,
      chemistry: p.chemistry,
      form: p.form,
      n: p.gradeN,
      p2o5: p.gradeP2o5,
      k2o: p.gradeK2o,
      s: p.gradeS,
      lbPerGal: p.lbPerGal,
      densitySource: p.densitySource,
      saltIndex: p.saltIndex,
      saltIndexSource: p.saltIndexSource,
      containsUrea: p.containsUrea,
      containsThiosulfate: p.containsThiosulfate,
    })),
    weather,
    digSites: digSites.map(({ deletedAt, dugAt, ...d }) => ({
      ...d,
      dugAt: iso(dugAt),
      deleted: deleted(deletedAt),
    })),
    dugPlants: dugPlants.map(({ deletedAt, ...p }) => ({
      ...p,
      leafStage: p.leafStage as Changes["dugPlants"][number]["leafStage"],
      findings: p.findings as Changes["dugPlants"][number]["findings"],
      deleted: deleted(deletedAt),
    })),
    photos: photos.map(({ deletedAt, capturedAt, confirmedAt, ...p }) => ({
      ...p,
      contentType: p.contentType as Changes["photos"][number]["contentType"],
      capturedAt: capturedAt ? iso(capturedAt) : null,
      confirmedAt: confirmedAt ? iso(confirmedAt) : null,
      deleted: deleted(deletedAt),
    })),
  };
}
