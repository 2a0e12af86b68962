import "server-only";
import type { PlantingPatch } from "@/lib/records/schemas";
import { db } from "../client";
import type { Planting } from "../schema";
import { updateVersioned } from "./versioning";

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
