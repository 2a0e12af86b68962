import "server-only";
import { sql } from "kysely";
import { db } from "../client";

export interface RegionSummary {
  id: string;
  name: string;
  accountCount: number;
  userCount: number;
  createdAt: Date;
}

export interface RegionOption {
  id: string;
  name: string;
}

export type RegionWriteResult =
  | { ok: true; region: RegionOption }
  | { ok: false; reason: "duplicate" | "not_found" };

// Every region with how many accounts and users it holds, by name.
export async function listRegions(): Promise<RegionSummary[]> {
  const rows = await db
    .selectFrom("region")
    .select((eb) => [
      "region.id",
      "region.name",
      "region.createdAt",
      eb
        .selectFrom("account")
        .select(eb.fn.countAll<string>().as("n"))
        .whereRef("account.regionId", "=", "region.id")
        .as("accountCount"),
      eb
        .selectFrom("appUser")
        .select(eb.fn.countAll<string>().as("n"))
        .whereRef("appUser.regionId", "=", "region.id")
        .as("userCount"),
    ])
    .orderBy("region.name")
    .execute();
  return rows.map((r) => ({
    ...r,
    accountCount: Number(r.accountCount ?? 0),
    userCount: Number(r.userCount ?? 0),
  }));
}

export async function listRegionOptions(): Promise<RegionOption[]> {
  return db.selectFrom("region").select(["id", "name"]).orderBy("name").execute();
}

export async function findRegion(id: string): Promise<RegionOption | undefined> {
  return db.selectFrom("region").select(["id", "name"]).where("id", "=", id).executeTakeFirst();
}

const isUniqueViolation = (err: unknown) => (err as { code?: string } | null)?.code === "23505";

// Names are unique regardless of case ("upper mesa" duplicates "Upper Mesa"). A new region gets its
// sync cursor in the same transaction, so devices in it can sync from the first moment.
export async function createRegion(name: string): Promise<RegionWriteResult> {
  try {
    return await db.transaction().execute(async (trx) => {
      const clash = await trx
        .selectFrom("region")
        .select("id")
        .where(sql<string>`lower(name)`, "=", name.toLowerCase())
        .executeTakeFirst();
      if (clash) return { ok: false, reason: "duplicate" } as const;
      const region = await trx
        .insertInto("region")
        .values({ name })
        .returning(["id", "name"])
        .executeTakeFirstOrThrow();
      await trx.insertInto("syncCursor").values({ regionId: region.id }).execute();
      return { ok: true, region } as const;
    });
  } catch (err) {
    if (isUniqueViolation(err)) return { ok: false, reason: "duplicate" };
    throw err;
  }
}

export async function renameRegion(id: string, name: string): Promise<RegionWriteResult> {
  try {
    return await db.transaction().execute(async (trx) => {
      const clash = await trx
        .selectFrom("region")
        .select("id")
        .where(sql<string>`lower(name)`, "=", name.toLowerCase())
        .where("id", "<>", id)
        .executeTakeFirst();
      if (clash) return { ok: false, reason: "duplicate" } as const;
      const region = await trx
        .updateTable("region")
        .set({ name })
        .where("id", "=", id)
        .returning(["id", "name"])
        .executeTakeFirst();
      return region ? ({ ok: true, region } as const) : ({ ok: false, reason: "not_found" } as const);
    });
  } catch (err) {
    if (isUniqueViolation(err)) return { ok: false, reason: "duplicate" };
    throw err;
  }
}
