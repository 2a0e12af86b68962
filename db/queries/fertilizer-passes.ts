import "server-only";
import { randomUUID } from "node:crypto";
import type { FertilizerPassCreate, FertilizerPassPatch } from "@/lib/records/schemas";
import { db } from "../client";
import type { FertilizerPass } from "../schema";
import { insertVersioned, updateVersioned } from "./versioning";

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

// A field's live fertilizer passes, in the order they were applied.
export async function listFertilizerPasses(fieldId: string): Promise<FertilizerPass[]> {
  return db
    .selectFrom("fertilizerPass")
    .selectAll()
    .where("fieldId", "=", fieldId)
    .where("deletedAt", "is", null)
    .orderBy("appliedOn")
    .orderBy("createdAt")
    .execute();
}

export function createFertilizerPass(
  field: { id: string; accountId: string },
  values: FertilizerPassCreate,
  change: { regionId: string; actorId: string },
) {
  return insertVersioned(
    "fertilizerPass",
    { id: randomUUID(), fieldId: field.id, accountId: field.accountId, ...values },
    change,
  );
}
