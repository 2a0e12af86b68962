import "server-only";
import { randomUUID } from "node:crypto";
import type { PlantingCreate, PlantingPatch } from "@/lib/records/schemas";
import { db } from "../client";
import type { Planting } from "../schema";
import { insertVersioned, updateVersioned } from "./versioning";

// A live planting by id, whoever asks; callers check `can` with its account's access.
export async function findPlanting(id: string): Promise<Planting | undefined> {
  return db
    .selectFrom("planting")
    .selectAll()
    .where("id", "=", id)
    .where("deletedAt", "is", null)
    .executeTakeFirst();
}

export function updatePlanting(
  id: string,
  patch: PlantingPatch,
  change: { regionId: string; actorId: string },
) {
  return updateVersioned("planting", id, patch, change);
}

// A field's live plantings, newest first.
export async function listPlantings(fieldId: string): Promise<Planting[]> {
  return db
    .selectFrom("planting")
    .selectAll()
    .where("fieldId", "=", fieldId)
    .where("deletedAt", "is", null)
    .orderBy("plantedOn", "desc")
    .orderBy("createdAt", "desc")
    .execute();
}

export function createPlanting(
  field: { id: string; accountId: string },
  values: PlantingCreate,
  change: { regionId: string; actorId: string },
) {
  return insertVersioned(
    "planting",
    { id: randomUUID(), fieldId: field.id, accountId: field.accountId, ...values },
    change,
  );
}
