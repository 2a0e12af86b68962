import "server-only";
import { type ExpressionBuilder, sql } from "kysely";
import type { AccountAccess, Actor } from "@/lib/auth/permissions";
import { db } from "../client";
import type { Database } from "../schema";

type Executor = Pick<typeof db, "selectFrom">;

// How the actor relates to one account, for `can` in lib/auth/permissions.ts; inside a transaction
// when one is given.
export async function findAccountAccess(
  actor: Actor,
  accountId: string,
  ex: Executor = db,
): Promise<AccountAccess | undefined> {
  const row = await ex
    .selectFrom("account")
    .select((eb) => [
      "account.id",
      "account.regionId",
      eb
        .exists(
          eb
            .selectFrom("accountRep")
            .whereRef("accountRep.accountId", "=", "account.id")
            .where("accountRep.userId", "=", actor.id),
        )
        .as("served"),
      eb
        .exists(
          eb
            .selectFrom("accountGrower")
            .whereRef("accountGrower.accountId", "=", "account.id")
            .where("accountGrower.userId", "=", actor.id),
        )
        .as("grown"),
    ])
    .where("account.id", "=", accountId)
    .executeTakeFirst();
  if (!row) return undefined;
  return {
    accountId: row.id,
    regionId: row.regionId,
    servedByActor: Boolean(row.served),
    grownByActor: Boolean(row.grown),
  };
}

// The same scope rule as `inScope`, as a filter on a query that has the account table joined.
export function accountVisibleTo(actor: Actor) {
  return (eb: ExpressionBuilder<Database, "account">) => {
    switch (actor.role) {
      case "admin":
        return sql<boolean>`true`;
      case "supervisor":
        return actor.regionId ? eb("account.regionId", "=", actor.regionId) : sql<boolean>`false`;
      case "rep":
        return eb(
          "account.id",
          "in",
          eb
            .selectFrom("accountRep")
            .select("accountRep.accountId")
            .where("accountRep.userId", "=", actor.id),
        );
      case "grower":
        return eb(
          "account.id",
          "in",
          eb
            .selectFrom("accountGrower")
            .select("accountGrower.accountId")
            .where("accountGrower.userId", "=", actor.id),
        );
    }
  };
}
