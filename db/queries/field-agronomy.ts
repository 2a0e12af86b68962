import "server-only";
import { db } from "../client";

export interface FieldPlantingDate {
  id: string;
  hybrid: string;
  plantedOn: string;
}

/** Live plantings of a field, earliest first; callers check `can` on the field. */
export async function listFieldPlantingDates(fieldId: string): Promise<FieldPlantingDate[]> {
  return db
    .selectFrom("planting")
    .select(["id", "hybrid", "plantedOn"])
    .where("fieldId", "=", fieldId)
    .where("deletedAt", "is", null)
    .orderBy("plantedOn")
    .orderBy("hybrid")
    .execute();
}

export interface DigRootIndex {
  id: string;
  dugAt: Date;
  /** The dig site's root development index, 0–100, as the server computed it. */
  rootIndex: number;
  /** Hybrid of the dig's planting; null when the dig names no planting. */
  hybrid: string | null;
  plantCount: number;
}

/** Live digs of a field that have a root index, oldest first; callers check `can` on the field. */
export async function listFieldDigRootIndices(fieldId: string): Promise<DigRootIndex[]> {
  const rows = await db
    .selectFrom("digSite")
    .leftJoin("planting", "planting.id", "digSite.plantingId")
    .select((eb) => [
      "digSite.id",
      "digSite.dugAt",
      "digSite.rootIndex",
      "planting.hybrid",
      eb
        .selectFrom("dugPlant")
        .select((p) => p.fn.countAll<number>().as("n"))
        .whereRef("dugPlant.digSiteId", "=", "digSite.id")
        .where("dugPlant.deletedAt", "is", null)
        .as("plantCount"),
    ])
    .where("digSite.fieldId", "=", fieldId)
    .where("digSite.deletedAt", "is", null)
    .where("digSite.rootIndex", "is not", null)
    .orderBy("digSite.dugAt")
    .execute();
  return rows.map((r) => ({
    id: r.id,
    dugAt: r.dugAt,
    rootIndex: r.rootIndex as number,
    hybrid: r.hybrid ?? null,
    plantCount: Number(r.plantCount ?? 0),
  }));
}
