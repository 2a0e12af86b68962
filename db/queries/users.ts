import "server-only";
import { db } from "../client";
import type { AppUser } from "../schema";

export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: AppUser["role"];
  regionId: string | null;
  units: AppUser["units"];
}

export async function findUserByEmail(email: string): Promise<AppUser | undefined> {
  return db
    .selectFrom("appUser")
    .selectAll()
    .where((eb) => eb(eb.fn("lower", ["email"]), "=", email.toLowerCase()))
    .executeTakeFirst();
}

// The signed-in user as the server sees them now: a deactivated user's session stops working at once.
export async function findActiveSessionUser(id: string): Promise<SessionUser | undefined> {
  return db
    .selectFrom("appUser")
    .select(["id", "email", "name", "role", "regionId", "units"])
    .where("id", "=", id)
    .where("status", "=", "active")
    .executeTakeFirst();
}
