import { NextResponse } from "next/server";
import { z } from "zod";
import { findAccountAccess } from "@/db/queries/access";
import { findField, updateFieldBoundary } from "@/db/queries/fields";
import { can, refusalStatus } from "@/lib/auth/permissions";
import { BOUNDARY_FORMATS, importBoundary } from "@/lib/geo/import";
import { authenticate, forbidden, handle, jsonError, notFoundJson, parseJson } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";

type Ctx = { params: Promise<{ id: string }> };

/** Largest boundary file accepted, bytes of the JSON body (a few thousand positions fit easily). */
const MAX_BOUNDARY_BYTES = 1024 * 1024;

const boundaryImportSchema = z.strictObject({
  format: z.enum(BOUNDARY_FORMATS, { error: "Choose the file format: geojson or kml." }),
  text: z.string({ error: "Send the file's text." }),
});

// Replaces the field's boundary with the one polygon of a GeoJSON or KML file; the area and centroid
// are computed here. A refused file changes nothing and answers 422 with every reason.
export const PUT = handle<Ctx>("PUT /api/fields/[id]/boundary", async (req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("field");
  const current = await findField(id);
  const access = current && (await findAccountAccess(auth.user, current.accountId));
  if (!current || !access) return notFoundJson("field");
  const resource = { kind: "field", access } as const;
  if (!can(auth.user, "write", resource)) {
    return refusalStatus(auth.user, resource) === 403 ? forbidden() : notFoundJson("field");
  }
  const body = await parseJson(req, boundaryImportSchema, MAX_BOUNDARY_BYTES);
  if (!body.ok) return body.response;
  const result = importBoundary(body.data.format, body.data.text);
  if (!result.ok) {
    return jsonError(
      422,
      "The boundary file was not imported.",
      result.errors.map((e) => ({ path: "text", message: e.message })),
    );
  }
  const field = await updateFieldBoundary(id, result.boundary, {
    regionId: access.regionId,
    actorId: auth.user.id,
  });
  if (!field) return notFoundJson("field");
  return NextResponse.json({
    field,
    areaAcres: result.boundary.areaAcres,
    areaHectares: result.boundary.areaHectares,
  });
});
