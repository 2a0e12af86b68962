import "server-only";
import { sql } from "kysely";
import { type Actor, can } from "@/lib/auth/permissions";
import type { InvitationCreate } from "@/lib/auth/schemas";
import { env } from "@/lib/env";
import { invitationMail } from "@/lib/mail/templates";
import { sendMail } from "@/lib/mail/transport";
import { db } from "../client";
import type { Role } from "../schema";
import { issueToken, type RedeemResult, redeemTokenWithPassword } from "./one-time-tokens";

export interface Invitation {
  userId: string;
  email: string;
  name: string;
  role: Role;
  regionId: string | null;
  accountIds: string[];
  expiresAt: Date;
  // True when the address already had an unanswered invitation, which this one replaces.
  reinvited: boolean;
}

export type InvitationRefusal =
  | "forbidden"
  | "activeUser"
  | "deactivatedUser"
  | "unknownRegion"
  | "unknownAccounts"
  | "busy";

export type InviteResult =
  | { ok: true; invitation: Invitation; mailSent: boolean }
  | { ok: false; reason: InvitationRefusal };

const PG_UNIQUE_VIOLATION = "23505";

class Refused extends Error {
  constructor(readonly reason: InvitationRefusal) {
    super(`invitation refused: ${reason}`);
  }
}

// Creates (or renews) the invitation and then e-mails the link. Every write happens in one
// transaction; the e-mail goes out after the commit, so a mail failure leaves a complete invitation
// that the admin can send again (`mailSent: false`). Used by the API route and the admin page.
export async function inviteUser(
  actor: Actor,
  input: InvitationCreate,
  inviterName: string,
): Promise<InviteResult> {
  const created = await createInvitation(actor, input);
  if (!created.ok) return created;
  const { invitation, token } = created;
  try {
    await sendMail(
      await invitationMail({
        to: invitation.email,
        name: invitation.name,
        role: invitation.role,
        inviterName,
        token,
        ttlHours: env.INVITE_TTL_HOURS,
      }),
    );
    return { ok: true, invitation, mailSent: true };
  } catch (err) {
    console.error(`[mail] invitation to user ${invitation.userId} could not be sent:`, err);
    return { ok: true, invitation, mailSent: false };
  }
}

export async function createInvitation(
  actor: Actor,
  input: InvitationCreate,
): Promise<{ ok: true; invitation: Invitation; token: string } | { ok: false; reason: InvitationRefusal }> {
  const regionId = input.regionId ?? null;
  if (!can(actor, "write", { kind: "user", regionId })) return { ok: false, reason: "forbidden" };
  const accountIds = [...new Set(input.accountIds ?? [])];

  try {
    return await db.transaction().execute(async (trx) => {
      if (regionId) {
        const region = await trx
          .selectFrom("region")
          .select("id")
          .where("id", "=", regionId)
          .executeTakeFirst();
        if (!region) throw new Refused("unknownRegion");
      }
      if (accountIds.length) {
        // Accounts must exist and lie in the invitee's region.
        if (!regionId) throw new Refused("unknownAccounts");
        const found = await trx
          .selectFrom("account")
          .select("id")
          .where("id", "in", accountIds)
          .where("regionId", "=", regionId)
          .execute();
        if (found.length !== accountIds.length) throw new Refused("unknownAccounts");
      }

      const existing = await trx
        .selectFrom("appUser")
        .select(["id", "status"])
        .where((eb) => eb(eb.fn("lower", ["email"]), "=", input.email.toLowerCase()))
        .forUpdate()
        .executeTakeFirst();
      if (existing?.status === "active") throw new Refused("activeUser");
      if (existing?.status === "deactivated") throw new Refused("deactivatedUser");

      let userId: string;
      if (existing) {
        // Not yet accepted: the new details replace the old ones, links included.
        await trx
          .updateTable("appUser")
          .set({ name: input.name, role: input.role, regionId, updatedAt: sql<Date>`now()` })
          .where("id", "=", existing.id)
          .execute();
        await trx.deleteFrom("accountRep").where("userId", "=", existing.id).execute();
        await trx.deleteFrom("accountGrower").where("userId", "=", existing.id).execute();
        userId = existing.id;
      } else {
        const row = await trx
          .insertInto("appUser")
          .values({ email: input.email, name: input.name, role: input.role, regionId, status: "invited" })
          .returning("id")
          .executeTakeFirstOrThrow();
        userId = row.id;
      }

      if (accountIds.length) {
        const table = input.role === "rep" ? "accountRep" : "accountGrower";
        await trx
          .insertInto(table)
          .values(accountIds.map((accountId) => ({ accountId, userId })))
          .execute();
      }

      const { token, expiresAt } = await issueToken(
        trx,
        userId,
        "invite",
        env.INVITE_TTL_HOURS * 3_600_000,
        actor.id,
      );
      return {
        ok: true as const,
        token,
        invitation: {
          userId,
          email: input.email,
          name: input.name,
          role: input.role,
          regionId,
          accountIds,
          expiresAt,
          reinvited: Boolean(existing),
        },
      };
    });
  } catch (err) {
    if (err instanceof Refused) return { ok: false, reason: err.reason };
    // Two admins inviting the same new address at once: the loser is told to try again.
    if ((err as { code?: string }).code === PG_UNIQUE_VIOLATION) return { ok: false, reason: "busy" };
    throw err;
  }
}

export type AcceptResult = RedeemResult;

// Sets the invitee's password and activates the sign-in, in one transaction with using up the link.
export function acceptInvitation(token: string, password: string): Promise<AcceptResult> {
  return redeemTokenWithPassword(token, password, "invite", "invited");
}

export interface InvitationChoices {
  regions: { id: string; name: string }[];
  accounts: { id: string; name: string; locality: string | null; regionId: string }[];
}

// The regions and accounts the admin's invite form offers.
export async function listInvitationChoices(actor: Actor): Promise<InvitationChoices> {
  if (actor.role !== "admin") return { regions: [], accounts: [] };
  const [regions, accounts] = await Promise.all([
    db.selectFrom("region").select(["id", "name"]).orderBy("name").execute(),
    db.selectFrom("account").select(["id", "name", "locality", "regionId"]).orderBy("name").execute(),
  ]);
  return { regions, accounts };
}
