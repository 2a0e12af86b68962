import { sql } from "kysely";
import { NextResponse } from "next/server";
import { db } from "@/db/client";
import { checkMailServer } from "@/lib/mail/transport";
import { checkObjectStore } from "@/lib/storage/s3";

export const dynamic = "force-dynamic";

async function probe(fn: () => Promise<unknown>): Promise<{ up: boolean; error?: string }> {
  try {
    await Promise.race([
      fn(),
      new Promise((_, reject) => setTimeout(() => reject(new Error("timed out")), 3000)),
    ]);
    return { up: true };
  } catch (err) {
    return { up: false, error: err instanceof Error ? err.message : String(err) };
  }
}

// 200 when the database, the object store and the mail server all answer; 503 naming what is down.
export async function GET() {
  const [database, objectStore, mail] = await Promise.all([
    probe(() => sql`select 1`.execute(db)),
    probe(checkObjectStore),
    probe(checkMailServer),
  ]);
  const services = { database, objectStore, mail };
  const down = Object.entries(services)
    .filter(([, s]) => !s.up)
    .map(([name]) => name);
  return NextResponse.json(
    { status: down.length ? "degraded" : "ok", down, services },
    { status: down.length ? 503 : 200, headers: { "Cache-Control": "no-store" } },
  );
}
