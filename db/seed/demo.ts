import "server-only";
import type { Kysely } from "kysely";
import { hashPassword } from "@/lib/auth/password";
import type { Database } from "../schema";
import { DEMO_PASSWORD, DEMO_REGION, DEMO_USERS } from "./demo-users";
import { seedDigs } from "./digs";
import { type AccountRef, seedFields } from "./fields";
import { SEED_VERSION } from "./ids";
import { seedPlantingsAndPasses } from "./plantings";
import { seedProducts } from "./products";
import { seedWeather } from "./weather";

// The invented demo scenario: one irrigated valley, two reps, a supervisor, an admin and four
// grower accounts with their fields, plantings, fertilizer passes, a season of weather, root digs,
// illustration photos and the injury cases the digs raise. Deterministic: the same rows every time.
// Runs inside the caller's transaction; only the photo bytes go to the bucket outside it, before the
// rows that point at them.
export async function seedDemo(db: Kysely<Database>) {
  const region = await db
    .insertInto("region")
    .values({ name: DEMO_REGION })
    .returning("id")
    .executeTakeFirstOrThrow();
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
  const accountRefs = new Map<string, AccountRef>();
  for (const a of accounts) {
    const acc = await db
      .insertInto("account")
      .values({ regionId: region.id, name: a.name, locality: a.locality })
      .returning("id")
      .executeTakeFirstOrThrow();
    await db.insertInto("accountRep").values({ accountId: acc.id, userId: users[a.rep]! }).execute();
    await db.insertInto("accountGrower").values({ accountId: acc.id, userId: users[a.grower]! }).execute();
    accountRefs.set(a.name, { id: acc.id, repId: users[a.rep]! });
  }

  const productIds = await seedProducts(db);
  const { stationId, records } = await seedWeather(db, region.id);
  const fields = await seedFields(db, accountRefs, stationId);
  const { plantings, passes } = await seedPlantingsAndPasses(db, fields, productIds);
  await seedDigs(db, { plantings, passes, weather: records });
  await db.insertInto("syncCursor").values({ regionId: region.id, version: SEED_VERSION }).execute();
}
