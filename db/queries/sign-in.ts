import "server-only";
import { db } from "../client";

// Repeated failed sign-ins for one e-mail address are slowed down, then refused for a while.
export const THROTTLE_WINDOW_MINUTES = 15;
export const THROTTLE_MAX_FAILURES = 5;

export async function countRecentFailures(email: string): Promise<number> {
  const row = await db
    .selectFrom("signInAttempt")
    .select((eb) => eb.fn.countAll<string>().as("count"))
    .where("email", "=", email)
    .where("succeeded", "=", false)
    .where("attemptedAt", ">", new Date(Date.now() - THROTTLE_WINDOW_MINUTES * 60_000))
    .executeTakeFirstOrThrow();
  return Number(row.count);
}

export async function recordSignInAttempt(email: string, succeeded: boolean) {
  await db.insertInto("signInAttempt").values({ email, succeeded }).execute();
  if (succeeded) {
    // A successful sign-in clears the slate for this address.
    await db.deleteFrom("signInAttempt").where("email", "=", email).where("succeeded", "=", false).execute();
  }
}
