import { NextResponse } from "next/server";
import { createRegion, listRegions } from "@/db/queries/regions";
import { regionCreateSchema } from "@/lib/admin/schemas";
import { can } from "@/lib/auth/permissions";
import { authenticate, forbidden, handle, jsonError, parseJson } from "@/lib/http";

export const GET = handle("GET /api/regions", async () => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  if (!can(auth.user, "read", { kind: "region" })) return forbidden();
  return NextResponse.json({ regions: await listRegions() });
});

// Admins create a region (and its sync cursor); names are unique regardless of case.
export const POST = handle("POST /api/regions", async (req) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  if (!can(auth.user, "write", { kind: "region" })) return forbidden();
  const body = await parseJson(req, regionCreateSchema);
  if (!body.ok) return body.response;
  const result = await createRegion(body.data.name);
  if (!result.ok) {
    return jsonError(409, `A region named "${body.data.name}" already exists. Choose another name.`, [
      { path: "name", message: "This name is already taken." },
    ]);
  }
  return NextResponse.json({ region: result.region }, { status: 201 });
});
