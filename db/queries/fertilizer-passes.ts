import "server-only";
import type { FertilizerPassPatch } from "@/lib/records/schemas";
import { db } from "../client";
import type { FertilizerPass } from "../schema";
import { updateVersioned } from "./versioning";

// A live fertilizer pass by id, whoever asks; callers check `can` with its account's access.
export async function findFertilizerPass(id: string): Promise<FertilizerPass | undefined> {
  return db
    .selectFrom("fertilizerPass")
    .selectAll()
    .where("id", "=", id)
    .where("deletedAt", "is", null)
    .executeTakeFirst();
}

export function updateFertilizerPass(
  id: string,
  patch: FertilizerPassPatch,
  change: { regionId: string; actorId: string },
) {
  return updateVersioned("fertilizerPass", id, patch, change);
}
