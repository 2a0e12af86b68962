import "server-only";
import type { Kysely } from "kysely";
import { hashPassword } from "@/lib/auth/password";
import type { Database } from "../schema";
import { DEMO_PASSWORD, DEMO_REGION, DEMO_USERS } from "./demo-users";

// The invented demo scenario: one irrigated valley, two reps, a supervisor, an admin and four
// grower accounts.
export async function seedDemo(db: Kysely<Database>) {
  const region = await db.insertInto("region").values({ name: DEMO_REGION }).returning("id").executeTakeFirstOrThrow();
  await db.insertInto("region").values({ name: "Upper Mesa" }).execute();
  const hash = await hashPassword(DEMO_PASSWORD);
  const users: Record<string, string> = {};
  for (const u of DEMO_USERS) {
    const row = await db
      .insertInto("appUser")
      .values({
        email: u.email,
        name: u.name,
        role: u.role,
        regionId: u.role === "admin" ? null : region.id,
        passwordHash: hash,
        status: "active",
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    users[u.key] = row.id;
  }
  const accounts = [
    { name: "Alder Creek Farms", locality: "North bench", rep: "rep1", grower: "grower1" },
    { name: "Bellweather Ranch", locality: "River bottom", rep: "rep1", grower: "grower2" },
    { name: "Cottonwood Bend Dairy", locality: "South canal", rep: "rep2", grower: "grower3" },
    { name: "Dry Wash Partners", locality: "East fan", rep: "rep2", grower: "grower4" },
  ];
  for (const a of accounts) {
    const acc = await db
      .insertInto("account")
      .values({ regionId: region.id, name: a.name, locality: a.locality })
      .returning("id")
      .executeTakeFirstOrThrow();
    await db.insertInto("accountRep").values({ accountId: acc.id, userId: users[a.rep]! }).execute();
    await db.insertInto("accountGrower").values({ accountId: acc.id, userId: users[a.grower]! }).execute();
  }
  await db.insertInto("syncCursor").values({ regionId: region.id }).execute();
}
