import "server-only";
import { db } from "../client";
import type { DigSite, DugPlant } from "../schema";

// A live dig site by id, whoever asks; callers check `can` with its account's access.
export async function findDigSite(id: string): Promise<DigSite | undefined> {
  return db
    .selectFrom("digSite")
    .selectAll()
    .where("id", "=", id)
    .where("deletedAt", "is", null)
    .executeTakeFirst();
}

// The live plants dug at a site, in the order they were dug.
export async function listDugPlants(digSiteId: string): Promise<DugPlant[]> {
  return db
    .selectFrom("dugPlant")
    .selectAll()
    .where("digSiteId", "=", digSiteId)
    .where("deletedAt", "is", null)
    .orderBy("position")
    .orderBy("createdAt")
    .execute();
}
