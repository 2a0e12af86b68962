import { NextResponse } from "next/server";
import { z } from "zod";
import { findMapFeatures } from "@/db/queries/map";
import { parseBounds } from "@/lib/geo/bounds";
import { authenticate, handle, jsonError, zodIssues } from "@/lib/http";
import { recordIdSchema } from "@/lib/records/schemas";

const day = (what: string) =>
  z.iso.date({ error: `Give the ${what} dig date as YYYY-MM-DD, for example 2026-04-28.` }).optional();

const querySchema = z
  .strictObject({
    bbox: z.string().optional(),
    from: day("first"),
    to: day("last"),
    hybrid: z.string().trim().min(1).max(80, { error: "The hybrid is at most 80 characters." }).optional(),
    stage: z
      .string()
      .regex(/^(VE|V([1-9]|1\d|2[0-5]))$/i, { error: "Give the leaf stage as VE, V1, V2 …" })
      .optional(),
    flagged: z.enum(["0", "1"], { error: "Use flagged=1 for flagged digs only." }).optional(),
    accountId: recordIdSchema.optional(),
    fieldId: recordIdSchema.optional(),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, {
    error: "The first date must be on or before the last date.",
    path: ["to"],
  });

// GET /api/map?bbox=west,south,east,north[&from&to&hybrid&stage&flagged=1&accountId&fieldId]: the field
// boundaries and dig pins of the accounts the actor may see, as GeoJSON.
export const GET = handle("GET /api/map", async (req) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const query = querySchema.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  const bounds = parseBounds(query.success ? query.data.bbox : new URL(req.url).searchParams.get("bbox"));
  const issues = [
    ...(bounds.ok ? [] : [{ path: "bbox", message: bounds.message }]),
    ...(query.success ? [] : zodIssues(query.error)),
  ];
  if (!query.success || !bounds.ok) return jsonError(400, "Some map filters are not valid.", issues);
  const q = query.data;
  const stage = q.stage?.toUpperCase();
  const collection = await findMapFeatures(auth.user, {
    bounds: bounds.bounds,
    from: q.from,
    to: q.to,
    hybrid: q.hybrid,
    stageCollars: stage === undefined ? undefined : stage === "VE" ? 0 : Number(stage.slice(1)),
    flaggedOnly: q.flagged === "1",
    accountId: q.accountId,
    fieldId: q.fieldId,
  });
  return NextResponse.json(collection, { headers: { "cache-control": "private, no-store" } });
});
