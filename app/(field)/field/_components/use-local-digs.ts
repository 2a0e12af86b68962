"use client";

import { useLiveQuery } from "dexie-react-hooks";
import { type FieldDatabase, fieldDb } from "@/sync/client/db";
import { type LocalDigSummary, listLocalDigs } from "@/sync/client/records";

// What the rep sees about a dig: "local" is a dig the server has never had (waiting, no server
// version yet); "waiting" is a synced dig with changes still to send.
export type DigDisplayState = "local" | "waiting" | "synced" | "conflict" | "rejected";

export interface DigListEntry extends LocalDigSummary {
  display: DigDisplayState;
  // Why the server refused the dig or one of its plants or photos.
  reason: string | null;
}

async function rejectionReasons(db: FieldDatabase): Promise<Map<string, string>> {
  const reasons = new Map<string, string>();
  const plants = await db.dugPlants.where("syncState").equals("rejected").toArray();
  const photos = await db.photos.where("syncState").equals("rejected").toArray();
  for (const row of [...plants, ...photos]) {
    if (row.rejectionReason && !reasons.has(row.digSiteId)) reasons.set(row.digSiteId, row.rejectionReason);
  }
  return reasons;
}

export async function loadDigList(db: FieldDatabase, limit?: number): Promise<DigListEntry[]> {
  const all = await listLocalDigs(db);
  const digs = limit === undefined ? all : all.slice(0, limit);
  const reasons = digs.some((d) => d.state === "rejected") ? await rejectionReasons(db) : new Map();
  return digs.map((d) => ({
    ...d,
    display: d.state === "waiting" && d.site.serverVersion === null ? "local" : d.state,
    reason: d.state === "rejected" ? (d.site.rejectionReason ?? reasons.get(d.site.id) ?? null) : null,
  }));
}

/** The digs on this phone, newest first, kept live; undefined while the first read runs. */
export function useLocalDigs(limit?: number): DigListEntry[] | undefined {
  return useLiveQuery(() => loadDigList(fieldDb(), limit), [limit]);
}
