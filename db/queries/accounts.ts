import "server-only";
import { sql } from "kysely";
import type { Actor } from "@/lib/auth/permissions";
import { db } from "../client";
import { accountVisibleTo } from "./access";

export interface AccountSummary {
  id: string;
  name: string;
  locality: string | null;
  regionName: string;
  fieldCount: number;
  digCount: number;
  reps: string[];
  growers: string[];
}

// Accounts the actor may see, with counts, ordered by name.
export async function listAccountSummaries(actor: Actor): Promise<AccountSummary[]> {
  const rows = await db
    .selectFrom("account")
    .innerJoin("region", "region.id", "account.regionId")
    .select((eb) => [
      "account.id",
      "account.name",
      "account.locality",
      "region.name as regionName",
      eb
        .selectFrom("field")
        .select(eb.fn.countAll<string>().as("n"))
        .whereRef("field.accountId", "=", "account.id")
        .where("field.deletedAt", "is", null)
        .as("fieldCount"),
      eb
        .selectFrom("digSite")
        .select(eb.fn.countAll<string>().as("n"))
        .whereRef("digSite.accountId", "=", "account.id")
        .where("digSite.deletedAt", "is", null)
        .as("digCount"),
      eb.fn
        .coalesce(
          eb
            .selectFrom("accountRep")
            .innerJoin("appUser", "appUser.id", "accountRep.userId")
            .select(sql<string[]>`array_agg(app_user.name order by app_user.name)`.as("names"))
            .whereRef("accountRep.accountId", "=", "account.id"),
          eb.val<string[]>([]),
        )
        .as("reps"),
      eb.fn
        .coalesce(
          eb
            .selectFrom("accountGrower")
            .innerJoin("appUser", "appUser.id", "accountGrower.userId")
            .select(sql<string[]>`array_agg(app_user.name order by app_user.name)`.as("names"))
            .whereRef("accountGrower.accountId", "=", "account.id"),
          eb.val<string[]>([]),
        )
        .as("growers"),
    ])
    .where(accountVisibleTo(actor))
    .orderBy("account.name")
    .execute();
  return rows.map((r) => ({
    ...r,
    fieldCount: Number(r.fieldCount ?? 0),
    digCount: Number(r.digCount ?? 0),
    reps: r.reps ?? [],
    growers: r.growers ?? [],
  }));
}

export interface AccountDetail {
  id: string;
  regionId: string;
  regionName: string;
  name: string;
  locality: string | null;
  createdAt: Date;
  updatedAt: Date;
}

// One account by id, whoever asks; callers check `can` with its access.
export async function findAccount(id: string): Promise<AccountDetail | undefined> {
  return db
    .selectFrom("account")
    .innerJoin("region", "region.id", "account.regionId")
    .select([
      "account.id",
      "account.regionId",
      "region.name as regionName",
      "account.name",
      "account.locality",
      "account.createdAt",
      "account.updatedAt",
    ])
    .where("account.id", "=", id)
    .executeTakeFirst();
}

// Renames an account or changes its locality; undefined when there is no such account.
export async function updateAccountDetails(
  id: string,
  patch: { name?: string; locality?: string | null },
): Promise<AccountDetail | undefined> {
  const updated = await db
    .updateTable("account")
    .set({ ...patch, updatedAt: sql`now()` })
    .where("id", "=", id)
    .returning("id")
    .executeTakeFirst();
  return updated ? findAccount(id) : undefined;
}
