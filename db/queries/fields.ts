import "server-only";
import type { Actor } from "@/lib/auth/permissions";
import type { GeoJsonPolygon } from "@/lib/geo/area";
import type { FieldPatch } from "@/lib/records/schemas";
import { db } from "../client";
import type { Field } from "../schema";
import { accountVisibleTo } from "./access";
import { updateVersioned } from "./versioning";

// A live field by id, whoever asks; callers check `can` with its account's access.
export async function findField(id: string): Promise<Field | undefined> {
  return db
    .selectFrom("field")
    .selectAll()
    .where("id", "=", id)
    .where("deletedAt", "is", null)
    .executeTakeFirst();
}

export interface FieldDetail extends Field {
  accountName: string;
  weatherStationName: string | null;
}

// A live field with its account's and weather station's names, whoever asks; callers check `can`.
export async function findFieldDetail(id: string): Promise<FieldDetail | undefined> {
  return db
    .selectFrom("field")
    .innerJoin("account", "account.id", "field.accountId")
    .leftJoin("weatherStation", "weatherStation.id", "field.weatherStationId")
    .selectAll("field")
    .select(["account.name as accountName", "weatherStation.name as weatherStationName"])
    .where("field.id", "=", id)
    .where("field.deletedAt", "is", null)
    .executeTakeFirst();
}

export interface FieldSummary {
  id: string;
  accountId: string;
  accountName: string;
  name: string;
  areaAcres: number | null;
  irrigation: Field["irrigation"];
  soilTexture: Field["soilTexture"];
  firstIrrigationOn: string | null;
  version: number;
}

// Live fields of the accounts the actor may see (of one account when given), by account then name.
export async function listFields(actor: Actor, accountId?: string): Promise<FieldSummary[]> {
  let query = db
    .selectFrom("field")
    .innerJoin("account", "account.id", "field.accountId")
    .select([
      "field.id",
      "field.accountId",
      "account.name as accountName",
      "field.name",
      "field.areaAcres",
      "field.irrigation",
      "field.soilTexture",
      "field.firstIrrigationOn",
      "field.version",
    ])
    .where("field.deletedAt", "is", null)
    .where(accountVisibleTo(actor));
  if (accountId) query = query.where("field.accountId", "=", accountId);
  return query.orderBy("account.name").orderBy("field.name").execute();
}

export function updateField(id: string, patch: FieldPatch, change: { regionId: string; actorId: string }) {
  return updateVersioned("field", id, patch, change);
}

// A new boundary with its area (acres) and centroid, through the same versioned update.
export function updateFieldBoundary(
  id: string,
  boundary: { polygon: GeoJsonPolygon; areaAcres: number; centroid: { lat: number; lon: number } },
  change: { regionId: string; actorId: string },
) {
  return updateVersioned(
    "field",
    id,
    {
      boundary: JSON.stringify(boundary.polygon),
      areaAcres: Math.round(boundary.areaAcres * 100) / 100,
      centroidLat: Math.round(boundary.centroid.lat * 1e7) / 1e7,
      centroidLon: Math.round(boundary.centroid.lon * 1e7) / 1e7,
    },
    change,
  );
}
