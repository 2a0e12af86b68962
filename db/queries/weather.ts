import "server-only";
import { sql } from "kysely";
import type { DailyTemperature } from "@/lib/agronomy";
import { db } from "../client";
import { nextVersion } from "./versioning";

export interface WeatherImportRow {
  date: string;
  maxF: number;
  minF: number;
}

export type WeatherImportResult =
  | {
      ok: true;
      stationId: string;
      stationName: string;
      createdStation: boolean;
      imported: number;
      /** Days that were already stored for the station and were overwritten. */
      replaced: number;
    }
  | { ok: false; reason: "noField" | "noLocation" };

const BATCH = 1000;

/**
 * Stores daily temperatures (°F) for a field's weather station in one transaction: all rows or none.
 * A field without a station gets one of its own ("<field> on-farm", at the field's centroid, in the
 * field's region), linked through a versioned update of the field so the link reaches phones by sync.
 * The rows take the region's next sync version like every synced write (weather days go to phones in
 * full on every pull). A day already stored for the station is overwritten. Idempotent for the same rows.
 */
export async function importFieldWeather(
  fieldId: string,
  rows: readonly WeatherImportRow[],
  { regionId, actorId }: { regionId: string; actorId: string },
): Promise<WeatherImportResult> {
  return db.transaction().execute(async (trx) => {
    const field = await trx
      .selectFrom("field")
      .select(["id", "name", "centroidLat", "centroidLon", "weatherStationId"])
      .where("id", "=", fieldId)
      .where("deletedAt", "is", null)
      .forUpdate()
      .executeTakeFirst();
    if (!field) return { ok: false, reason: "noField" } as const;

    let station = field.weatherStationId
      ? await trx
          .selectFrom("weatherStation")
          .select(["id", "name"])
          .where("id", "=", field.weatherStationId)
          .executeTakeFirst()
      : undefined;
    let createdStation = false;
    if (!station && (field.centroidLat === null || field.centroidLon === null)) {
      return { ok: false, reason: "noLocation" } as const;
    }
    const version = await nextVersion(trx, regionId);
    if (!station) {
      station = await trx
        .insertInto("weatherStation")
        .values({
          regionId,
          name: `${field.name} on-farm`,
          latitude: field.centroidLat as number,
          longitude: field.centroidLon as number,
        })
        .returning(["id", "name"])
        .executeTakeFirstOrThrow();
      createdStation = true;
      await trx
        .updateTable("field")
        .set({
          weatherStationId: station.id,
          version,
          fieldVersions: sql`field_versions || ${JSON.stringify({ weatherStationId: version })}::jsonb`,
          updatedBy: actorId,
          updatedAt: sql`now()`,
        })
        .where("id", "=", field.id)
        .execute();
    }

    const stationId = station.id;
    const existing = await trx
      .selectFrom("weatherDaily")
      .select((eb) => eb.fn.countAll<number>().as("n"))
      .where("stationId", "=", stationId)
      .where(
        "day",
        "in",
        rows.map((r) => r.date),
      )
      .executeTakeFirstOrThrow();
    for (let i = 0; i < rows.length; i += BATCH) {
      await trx
        .insertInto("weatherDaily")
        .values(
          rows.slice(i, i + BATCH).map((r) => ({
            stationId,
            day: r.date,
            maxF: r.maxF,
            minF: r.minF,
            source: "upload",
            version,
          })),
        )
        .onConflict((oc) =>
          oc.columns(["stationId", "day"]).doUpdateSet((eb) => ({
            maxF: eb.ref("excluded.maxF"),
            minF: eb.ref("excluded.minF"),
            source: eb.ref("excluded.source"),
            version: eb.ref("excluded.version"),
          })),
        )
        .execute();
    }
    return {
      ok: true,
      stationId,
      stationName: station.name,
      createdStation,
      imported: rows.length,
      replaced: Number(existing.n),
    } as const;
  });
}

export interface StationWeather {
  id: string;
  name: string;
  /** Live fields that read this station's weather. */
  fieldCount: number;
  records: DailyTemperature[];
}

/** A station with its daily temperatures (°F) in date order, or undefined. */
export async function findStationWeather(stationId: string): Promise<StationWeather | undefined> {
  const station = await db
    .selectFrom("weatherStation")
    .select((eb) => [
      "weatherStation.id",
      "weatherStation.name",
      eb
        .selectFrom("field")
        .select((f) => f.fn.countAll<number>().as("n"))
        .whereRef("field.weatherStationId", "=", "weatherStation.id")
        .where("field.deletedAt", "is", null)
        .as("fieldCount"),
    ])
    .where("weatherStation.id", "=", stationId)
    .executeTakeFirst();
  if (!station) return undefined;
  const days = await db
    .selectFrom("weatherDaily")
    .select(["day", "maxF", "minF"])
    .where("stationId", "=", stationId)
    .orderBy("day")
    .execute();
  return {
    id: station.id,
    name: station.name,
    fieldCount: Number(station.fieldCount ?? 0),
    records: days.map((d) => ({ date: d.day, maxF: d.maxF, minF: d.minF })),
  };
}
