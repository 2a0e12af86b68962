import "server-only";
import { sql } from "kysely";
import { env } from "@/lib/env";
import { db } from "../client";
import { issueToken, type RedeemResult, redeemTokenWithPassword } from "./one-time-tokens";

// At most this many reset e-mails per sign-in per hour, so the form cannot be used to flood an inbox.
export const RESET_REQUESTS_PER_HOUR = 5;

export interface ResetRequest {
  email: string;
  name: string;
  token: string;
}

// A reset link for an active sign-in with this address, or null (unknown, invited, deactivated or
// asked too often). The caller answers the same either way, so nobody learns which addresses exist.
export async function requestPasswordReset(email: string): Promise<ResetRequest | null> {
  return db.transaction().execute(async (trx) => {
    const user = await trx
      .selectFrom("appUser")
      .select(["id", "email", "name"])
      .where((eb) => eb(eb.fn("lower", ["email"]), "=", email.toLowerCase()))
      .where("status", "=", "active")
      .forUpdate()
      .executeTakeFirst();
    if (!user) return null;
    const recent = await trx
      .selectFrom("oneTimeToken")
      .select((eb) => eb.fn.countAll<string>().as("n"))
      .where("userId", "=", user.id)
      .where("purpose", "=", "password_reset")
      .where("createdAt", ">", sql<Date>`now() - interval '1 hour'`)
      .executeTakeFirstOrThrow();
    if (Number(recent.n) >= RESET_REQUESTS_PER_HOUR) return null;
    const { token } = await issueToken(trx, user.id, "password_reset", env.RESET_TTL_MINUTES * 60_000, null);
    return { email: user.email, name: user.name, token };
  });
}

export type ResetResult = RedeemResult;

// Replaces the password of an active sign-in and uses up the link, in one transaction. Earlier
// failed sign-ins of the address are forgiven: the throttle's own message points here.
export function completePasswordReset(token: string, password: string): Promise<ResetResult> {
  return redeemTokenWithPassword(token, password, "password_reset", "active", async (trx, user) => {
    await trx
      .deleteFrom("signInAttempt")
      .where("email", "=", user.email.toLowerCase())
      .where("succeeded", "=", false)
      .execute();
  });
}
