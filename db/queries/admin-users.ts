import "server-only";
import { db } from "../client";

export async function countUsersByStatus(): Promise<{ invited: number; active: number; deactivated: number }> {
  const rows = await db
    .selectFrom("appUser")
    .select((eb) => ["status", eb.fn.countAll<string>().as("n")])
    .groupBy("status")
    .execute();
  const counts = { invited: 0, active: 0, deactivated: 0 };
  for (const r of rows) counts[r.status] = Number(r.n);
  return counts;
}
