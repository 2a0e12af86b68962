import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "../schema";
import { seedDemo } from "./demo";

// Seeds the invented demo scenario into an empty database; returns whether it seeded.
export async function seedDemoIfEmpty(db: Kysely<Database>): Promise<boolean> {
  const { count } = await db
    .selectFrom("appUser")
    .select((eb) => eb.fn.countAll<number>().as("count"))
    .executeTakeFirstOrThrow();
  if (Number(count) > 0) return false;
  await db.transaction().execute((trx) => seedDemo(trx));
  return true;
}
