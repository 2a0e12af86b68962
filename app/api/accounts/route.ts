import { NextResponse } from "next/server";
import { listAccountSummaries } from "@/db/queries/accounts";
import { authenticate, handle } from "@/lib/http";

export const GET = handle("GET /api/accounts", async () => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  return NextResponse.json({ accounts: await listAccountSummaries(auth.user) });
});
