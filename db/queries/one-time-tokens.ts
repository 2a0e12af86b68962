import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { type Kysely, sql, type Transaction } from "kysely";
import { hashPassword } from "@/lib/auth/password";
import { db } from "../client";
import type { Database, OneTimeTokenTable, Role } from "../schema";

// Single-use e-mail links (invitations and password resets). The link carries 32 random bytes; only
// their SHA-256 is stored, so a copy of the database cannot be turned into working links.

export type TokenPurpose = OneTimeTokenTable["purpose"];
export type UnusableToken = "invalid" | "expired" | "used";

export interface TokenHolder {
  id: string;
  email: string;
  name: string;
  role: Role;
}

export type TokenInspection =
  | { state: "valid"; user: TokenHolder; expiresAt: Date }
  | { state: UnusableToken };

export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

// Issues a fresh token for the user and retires the user's older unused tokens of the same purpose,
// so only the newest e-mail works. Runs inside the caller's transaction.
export async function issueToken(
  trx: Transaction<Database>,
  userId: string,
  purpose: TokenPurpose,
  ttlMs: number,
  createdBy: string | null,
): Promise<{ token: string; expiresAt: Date }> {
  await retireTokens(trx, userId, purpose);
  const token = randomBytes(32).toString("base64url");
  const row = await trx
    .insertInto("oneTimeToken")
    .values({
      userId,
      purpose,
      tokenHash: hashToken(token),
      expiresAt: sql<Date>`now() + ${`${Math.round(ttlMs)} milliseconds`}::interval`,
      createdBy,
    })
    .returning("expiresAt")
    .executeTakeFirstOrThrow();
  return { token, expiresAt: row.expiresAt };
}

// A retired link reads as expired: the user is told to ask for a new one, which is the remedy.
export async function retireTokens(
  trx: Kysely<Database>,
  userId: string,
  purpose: TokenPurpose,
): Promise<void> {
  await trx
    .updateTable("oneTimeToken")
    .set({ expiresAt: sql<Date>`now()` })
    .where("userId", "=", userId)
    .where("purpose", "=", purpose)
    .where("usedAt", "is", null)
    .where("expiresAt", ">", sql<Date>`now()`)
    .execute();
}

// Marks the token used in one statement, so of two simultaneous uses only one gets the user id back.
export async function consumeToken(
  trx: Transaction<Database>,
  token: string,
  purpose: TokenPurpose,
): Promise<string | undefined> {
  const row = await trx
    .updateTable("oneTimeToken")
    .set({ usedAt: sql<Date>`now()` })
    .where("tokenHash", "=", hashToken(token))
    .where("purpose", "=", purpose)
    .where("usedAt", "is", null)
    .where("expiresAt", ">", sql<Date>`now()`)
    .returning("userId")
    .executeTakeFirst();
  return row?.userId;
}

// What a link is worth right now, for the page that shows it and for the reason a use was refused.
// `userStatus` is the status the holder must still have for the link to mean anything.
export async function inspectToken(
  token: string,
  purpose: TokenPurpose,
  userStatus: "invited" | "active",
): Promise<TokenInspection> {
  const row = await db
    .selectFrom("oneTimeToken")
    .innerJoin("appUser", "appUser.id", "oneTimeToken.userId")
    .select([
      "appUser.id",
      "appUser.email",
      "appUser.name",
      "appUser.role",
      "appUser.status",
      "oneTimeToken.usedAt",
      "oneTimeToken.expiresAt",
      sql<boolean>`one_time_token.expires_at <= now()`.as("isExpired"),
    ])
    .where("oneTimeToken.tokenHash", "=", hashToken(token))
    .where("oneTimeToken.purpose", "=", purpose)
    .executeTakeFirst();
  if (!row) return { state: "invalid" };
  if (row.usedAt) return { state: "used" };
  if (row.isExpired) return { state: "expired" };
  if (row.status !== userStatus) return { state: "invalid" };
  return {
    state: "valid",
    user: { id: row.id, email: row.email, name: row.name, role: row.role },
    expiresAt: row.expiresAt,
  };
}

// Thrown inside a transaction to roll it back when the token's holder is no longer eligible.
export class TokenRefused extends Error {
  constructor(readonly reason: UnusableToken) {
    super(`token refused: ${reason}`);
  }
}

export async function explainRefusal(token: string, purpose: TokenPurpose, userStatus: "invited" | "active") {
  const found = await inspectToken(token, purpose, userStatus);
  // Valid now but refused a moment ago means a concurrent use won the race.
  return found.state === "valid" ? "used" : found.state;
}

export type RedeemResult = { ok: true; email: string } | { ok: false; reason: UnusableToken };

// Uses up a link and sets the holder's new password in one transaction: the holder must still have
// `userStatus`; `activate` also turns an invited sign-in active; `afterwards` runs in the same
// transaction. Two concurrent uses of one link: exactly one succeeds.
export async function redeemTokenWithPassword(
  token: string,
  password: string,
  purpose: TokenPurpose,
  userStatus: "invited" | "active",
  afterwards?: (trx: Transaction<Database>, user: { id: string; email: string }) => Promise<void>,
): Promise<RedeemResult> {
  // Refuse a dead link before spending a bcrypt hash on it.
  const before = await inspectToken(token, purpose, userStatus);
  if (before.state !== "valid") return { ok: false, reason: before.state };
  const passwordHash = await hashPassword(password);
  try {
    const email = await db.transaction().execute(async (trx) => {
      const userId = await consumeToken(trx, token, purpose);
      if (!userId) throw new TokenRefused(await explainRefusal(token, purpose, userStatus));
      const user = await trx
        .updateTable("appUser")
        .set({ passwordHash, status: "active", updatedAt: sql<Date>`now()` })
        .where("id", "=", userId)
        .where("status", "=", userStatus)
        .returning(["id", "email"])
        .executeTakeFirst();
      if (!user) throw new TokenRefused("invalid");
      await retireTokens(trx, userId, purpose);
      await afterwards?.(trx, user);
      return user.email;
    });
    return { ok: true, email };
  } catch (err) {
    if (err instanceof TokenRefused) return { ok: false, reason: err.reason };
    throw err;
  }
}
