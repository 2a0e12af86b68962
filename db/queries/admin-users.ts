import "server-only";
import { sql } from "kysely";
import type { UserUpdate } from "@/lib/admin/schemas";
import type { Actor } from "@/lib/auth/permissions";
import { db } from "../client";
import type { Role, UserStatus } from "../schema";

export async function countUsersByStatus(): Promise<{
  invited: number;
  active: number;
  deactivated: number;
}> {
  const rows = await db
    .selectFrom("appUser")
    .select((eb) => ["status", eb.fn.countAll<string>().as("n")])
    .groupBy("status")
    .execute();
  const counts = { invited: 0, active: 0, deactivated: 0 };
  for (const r of rows) counts[r.status] = Number(r.n);
  return counts;
}

export interface AccountRef {
  id: string;
  name: string;
}

export interface AdminUserRow {
  id: string;
  name: string;
  email: string;
  role: Role;
  regionId: string | null;
  regionName: string | null;
  status: UserStatus;
  createdAt: Date;
  // Accounts the user serves (as a rep) or belongs to (as a grower), whatever their role is now.
  repAccounts: AccountRef[];
  growerAccounts: AccountRef[];
}

export interface UserListQuery {
  q?: string;
  role?: Role;
  // "none": users with no region.
  regionId?: string;
  status?: UserStatus;
  page: number;
  pageSize: number;
}

// `%`, `_` and `\` in a search are literal characters, not patterns.
export const likePattern = (q: string) => `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

function memberAccounts(table: "accountRep" | "accountGrower") {
  return sql<AccountRef[]>`coalesce((
    select json_agg(json_build_object('id', a.id, 'name', a.name) order by a.name)
    from ${sql.table(table === "accountRep" ? "account_rep" : "account_grower")} m
    join account a on a.id = m.account_id
    where m.user_id = app_user.id
  ), '[]'::json)`;
}

function baseUserQuery() {
  return db
    .selectFrom("appUser")
    .leftJoin("region", "region.id", "appUser.regionId")
    .select([
      "appUser.id",
      "appUser.name",
      "appUser.email",
      "appUser.role",
      "appUser.regionId",
      "region.name as regionName",
      "appUser.status",
      "appUser.createdAt",
      memberAccounts("accountRep").as("repAccounts"),
      memberAccounts("accountGrower").as("growerAccounts"),
    ]);
}

// One page of users matching the filters, by name, with the total count for paging. Callers decide
// who may list whom (lib/auth/permissions.ts) and narrow with `regionId` for a supervisor.
export async function listUsers(query: UserListQuery): Promise<{ users: AdminUserRow[]; total: number }> {
  let q = baseUserQuery();
  if (query.q) {
    const pattern = likePattern(query.q);
    q = q.where((eb) => eb.or([eb("appUser.name", "ilike", pattern), eb("appUser.email", "ilike", pattern)]));
  }
  if (query.role) q = q.where("appUser.role", "=", query.role);
  if (query.status) q = q.where("appUser.status", "=", query.status);
  if (query.regionId === "none") q = q.where("appUser.regionId", "is", null);
  else if (query.regionId) q = q.where("appUser.regionId", "=", query.regionId);

  const [users, count] = await Promise.all([
    q
      .orderBy("appUser.name")
      .orderBy("appUser.id")
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize)
      .execute(),
    q
      .clearSelect()
      .select((eb) => eb.fn.countAll<string>().as("n"))
      .executeTakeFirstOrThrow(),
  ]);
  return { users, total: Number(count.n) };
}

export async function findAdminUser(id: string): Promise<AdminUserRow | undefined> {
  return baseUserQuery().where("appUser.id", "=", id).executeTakeFirst();
}

export type UserUpdateResult =
  | { ok: true; user: AdminUserRow; stillAssigned: { rep: AccountRef[]; grower: AccountRef[] } }
  | { ok: false; reason: "not_found" | "region_not_found" | "self_deactivate" | "self_demote" };

// The one write path for a user's role, region and status (server actions and PATCH /api/users/[id]).
// The caller has checked that `actor` may change users. An admin never locks themselves out.
// Changing the role removes no account assignments: the result lists the ones the user still has
// under a role they no longer hold, for the admin to review.
export async function updateUser(actor: Actor, id: string, patch: UserUpdate): Promise<UserUpdateResult> {
  if (id === actor.id && patch.status === "deactivated") return { ok: false, reason: "self_deactivate" };
  if (id === actor.id && patch.role !== undefined && patch.role !== "admin") {
    return { ok: false, reason: "self_demote" };
  }
  const result = await db.transaction().execute(async (trx) => {
    const current = await trx
      .selectFrom("appUser")
      .select(["id", "passwordHash", "status"])
      .where("id", "=", id)
      .forUpdate()
      .executeTakeFirst();
    if (!current) return "not_found" as const;
    if (patch.regionId) {
      const region = await trx
        .selectFrom("region")
        .select("id")
        .where("id", "=", patch.regionId)
        .executeTakeFirst();
      if (!region) return "region_not_found" as const;
    }
    let status: UserStatus | undefined;
    if (patch.status === "deactivated") status = "deactivated";
    // Reactivating someone who never set a password puts them back to "invited", not "active".
    else if (patch.status === "active") status = current.passwordHash ? "active" : "invited";
    await trx
      .updateTable("appUser")
      .set({
        ...(patch.role !== undefined ? { role: patch.role } : {}),
        ...(patch.regionId !== undefined ? { regionId: patch.regionId } : {}),
        ...(status !== undefined ? { status } : {}),
        updatedAt: new Date(),
      })
      .where("id", "=", id)
      .execute();
    return "ok" as const;
  });
  if (result !== "ok") return { ok: false, reason: result };
  const user = (await findAdminUser(id))!;
  return {
    ok: true,
    user,
    stillAssigned: {
      rep: user.role === "rep" ? [] : user.repAccounts,
      grower: user.role === "grower" ? [] : user.growerAccounts,
    },
  };
}
