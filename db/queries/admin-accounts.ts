import "server-only";
import { sql } from "kysely";
import type { MemberKind } from "@/lib/admin/schemas";
import { db } from "../client";
import type { Role, UserStatus } from "../schema";
import { likePattern } from "./admin-users";

export interface AccountMember {
  id: string;
  name: string;
  email: string;
  role: Role;
  status: UserStatus;
  regionId: string | null;
}

export interface AdminAccountRow {
  id: string;
  name: string;
  locality: string | null;
  regionId: string;
  regionName: string;
  fieldCount: number;
  reps: AccountMember[];
  growers: AccountMember[];
}

export interface AccountListQuery {
  q?: string;
  regionId?: string;
  page: number;
  pageSize: number;
}

function members(kind: MemberKind) {
  return sql<AccountMember[]>`coalesce((
    select json_agg(json_build_object(
      'id', u.id, 'name', u.name, 'email', u.email, 'role', u.role, 'status', u.status, 'region_id', u.region_id
    ) order by u.name)
    from ${sql.table(kind === "rep" ? "account_rep" : "account_grower")} m
    join app_user u on u.id = m.user_id
    where m.account_id = account.id
  ), '[]'::json)`;
}

function baseAccountQuery() {
  return db
    .selectFrom("account")
    .innerJoin("region", "region.id", "account.regionId")
    .select((eb) => [
      "account.id",
      "account.name",
      "account.locality",
      "account.regionId",
      "region.name as regionName",
      eb
        .selectFrom("field")
        .select(eb.fn.countAll<string>().as("n"))
        .whereRef("field.accountId", "=", "account.id")
        .where("field.deletedAt", "is", null)
        .as("fieldCount"),
      members("rep").as("reps"),
      members("grower").as("growers"),
    ]);
}

const toRow = <R extends { fieldCount: string | number | null }>(r: R) => ({
  ...r,
  fieldCount: Number(r.fieldCount ?? 0),
});

// One page of accounts (all regions; admins only), by name, with the total for paging. Search matches
// the account's name or locality.
export async function listAdminAccounts(
  query: AccountListQuery,
): Promise<{ accounts: AdminAccountRow[]; total: number }> {
  let q = baseAccountQuery();
  if (query.q) {
    const pattern = likePattern(query.q);
    q = q.where((eb) =>
      eb.or([eb("account.name", "ilike", pattern), eb("account.locality", "ilike", pattern)]),
    );
  }
  if (query.regionId) q = q.where("account.regionId", "=", query.regionId);
  const [rows, count] = await Promise.all([
    q
      .orderBy("account.name")
      .orderBy("account.id")
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize)
      .execute(),
    q
      .clearSelect()
      .select((eb) => eb.fn.countAll<string>().as("n"))
      .executeTakeFirstOrThrow(),
  ]);
  return { accounts: rows.map(toRow), total: Number(count.n) };
}

export async function findAdminAccount(id: string): Promise<AdminAccountRow | undefined> {
  const row = await baseAccountQuery().where("account.id", "=", id).executeTakeFirst();
  return row ? toRow(row) : undefined;
}

// Who may be added to an account: reps of the account's region, and growers of that region or with
// no region yet; never someone deactivated or already assigned.
export async function listAssignableUsers(accountId: string, kind: MemberKind): Promise<AccountMember[]> {
  const account = await db
    .selectFrom("account")
    .select("regionId")
    .where("id", "=", accountId)
    .executeTakeFirst();
  if (!account) return [];
  const table = kind === "rep" ? "accountRep" : "accountGrower";
  return db
    .selectFrom("appUser")
    .select(["id", "name", "email", "role", "status", "regionId"])
    .where("role", "=", kind)
    .where("status", "<>", "deactivated")
    .where((eb) =>
      kind === "rep"
        ? eb("regionId", "=", account.regionId)
        : eb.or([eb("regionId", "=", account.regionId), eb("regionId", "is", null)]),
    )
    .where((eb) =>
      eb.not(
        eb.exists(
          eb
            .selectFrom(table)
            .select(`${table}.userId`)
            .whereRef(`${table}.userId`, "=", "appUser.id")
            .where(`${table}.accountId`, "=", accountId),
        ),
      ),
    )
    .orderBy("name")
    .execute();
}

export type AccountWriteResult =
  | { ok: true; account: AdminAccountRow }
  | { ok: false; reason: "not_found" | "region_not_found" };

export async function createAccount(values: {
  name: string;
  locality: string | null;
  regionId: string;
}): Promise<AccountWriteResult> {
  const region = await db
    .selectFrom("region")
    .select("id")
    .where("id", "=", values.regionId)
    .executeTakeFirst();
  if (!region) return { ok: false, reason: "region_not_found" };
  const { id } = await db.insertInto("account").values(values).returning("id").executeTakeFirstOrThrow();
  return { ok: true, account: (await findAdminAccount(id))! };
}

// Renames or moves an account. Moving it keeps its reps and growers; the account page points out
// members whose region no longer matches.
export async function updateAccount(
  id: string,
  values: { name: string; locality: string | null; regionId: string },
): Promise<AccountWriteResult> {
  const region = await db
    .selectFrom("region")
    .select("id")
    .where("id", "=", values.regionId)
    .executeTakeFirst();
  if (!region) return { ok: false, reason: "region_not_found" };
  const updated = await db
    .updateTable("account")
    .set({ ...values, updatedAt: new Date() })
    .where("id", "=", id)
    .returning("id")
    .executeTakeFirst();
  if (!updated) return { ok: false, reason: "not_found" };
  return { ok: true, account: (await findAdminAccount(id))! };
}

export type MemberWriteResult =
  | { ok: true; member: AccountMember }
  | { ok: false; reason: "not_found" | "user_not_found" | "wrong_role" | "wrong_region" | "deactivated" };

// Adds a rep or grower to an account; adding someone already there is a no-op that still succeeds.
export async function assignAccountMember(
  accountId: string,
  userId: string,
  kind: MemberKind,
): Promise<MemberWriteResult> {
  const account = await db
    .selectFrom("account")
    .select("regionId")
    .where("id", "=", accountId)
    .executeTakeFirst();
  if (!account) return { ok: false, reason: "not_found" };
  const user = await db
    .selectFrom("appUser")
    .select(["id", "name", "email", "role", "status", "regionId"])
    .where("id", "=", userId)
    .executeTakeFirst();
  if (!user) return { ok: false, reason: "user_not_found" };
  if (user.role !== kind) return { ok: false, reason: "wrong_role" };
  if (user.status === "deactivated") return { ok: false, reason: "deactivated" };
  const regionOk = user.regionId === account.regionId || (kind === "grower" && user.regionId === null);
  if (!regionOk) return { ok: false, reason: "wrong_region" };
  await db
    .insertInto(kind === "rep" ? "accountRep" : "accountGrower")
    .values({ accountId, userId })
    .onConflict((oc) => oc.columns(["accountId", "userId"]).doNothing())
    .execute();
  return { ok: true, member: user };
}

// Removes a rep or grower from an account; returns who was removed, or undefined when they were not on it.
export async function unassignAccountMember(
  accountId: string,
  userId: string,
  kind: MemberKind,
): Promise<{ id: string; name: string } | undefined> {
  const removed = await db
    .deleteFrom(kind === "rep" ? "accountRep" : "accountGrower")
    .where("accountId", "=", accountId)
    .where("userId", "=", userId)
    .returning("userId")
    .executeTakeFirst();
  if (!removed) return undefined;
  return db.selectFrom("appUser").select(["id", "name"]).where("id", "=", userId).executeTakeFirst();
}
