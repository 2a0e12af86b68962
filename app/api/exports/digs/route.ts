import Papa from "papaparse";
import { z } from "zod";
import { findAccountAccess } from "@/db/queries/access";
import { findField } from "@/db/queries/fields";
import { type ExportScope, listDigExportRows, listPlantExportRows } from "@/db/queries/reports";
import { can } from "@/lib/auth/permissions";
import { authenticate, handle, jsonError, notFoundJson, zodIssues } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";
import { csvCell } from "@/lib/reports/csv";

export const dynamic = "force-dynamic";

const querySchema = z
  .object({
    fieldId: z.string().optional(),
    accountId: z.string().optional(),
    kind: z.enum(["digs", "plants"]).default("digs"),
  })
  .refine((q) => (q.fieldId === undefined) !== (q.accountId === undefined), {
    message: "Give either fieldId or accountId.",
    path: ["fieldId"],
  });

const isoDate = (d: Date) => d.toISOString();

// CSV of a field's or an account's digs (one row per dig) or dug plants (one row per plant with its
// dig's columns); RFC 4180 quoting through papaparse, ISO 8601 dates, units in the headers.
export const GET = handle("GET /api/exports/digs", async (req: Request) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const params = Object.fromEntries(new URL(req.url).searchParams);
  const parsed = querySchema.safeParse(params);
  if (!parsed.success) return jsonError(400, "Some values are not valid.", zodIssues(parsed.error));
  const { fieldId, accountId, kind } = parsed.data;

  let scope: ExportScope;
  let name: string;
  if (fieldId !== undefined) {
    if (!isRecordId(fieldId)) return notFoundJson("field");
    const field = await findField(fieldId);
    const access = field && (await findAccountAccess(auth.user, field.accountId));
    if (!field || !access || !can(auth.user, "read", { kind: "field", access })) return notFoundJson("field");
    scope = { fieldId };
    name = field.name;
  } else {
    if (!accountId || !isRecordId(accountId)) return notFoundJson("account");
    const access = await findAccountAccess(auth.user, accountId);
    if (!access || !can(auth.user, "read", { kind: "account", access })) return notFoundJson("account");
    scope = { accountId };
    name = "account";
  }

  let fields: string[];
  let data: (string | number | boolean)[][];
  if (kind === "digs") {
    const rows = await listDigExportRows(scope);
    fields = [
      "dig_id",
      "account",
      "field",
      "hybrid",
      "planted_on",
      "dug_at",
      "rep",
      "latitude_deg",
      "longitude_deg",
      "accuracy_m",
      "soil_moisture",
      "soil_temp_f",
      "irrigated_yet",
      "plants_dug",
      "root_index_0_100",
      "flagged_by_rep",
      "recommendation",
      "notes",
    ];
    data = rows.map((r) =>
      [
        r.id,
        r.accountName,
        r.fieldName,
        r.hybrid,
        r.plantedOn,
        isoDate(r.dugAt),
        r.repName,
        r.latitude,
        r.longitude,
        r.accuracyM,
        r.soilMoisture,
        r.soilTempF,
        r.irrigatedYet,
        Number(r.plantCount ?? 0),
        r.rootIndex,
        r.flaggedByRep,
        r.recommendation,
        r.notes,
      ].map(csvCell),
    );
  } else {
    const rows = await listPlantExportRows(scope);
    fields = [
      "dig_id",
      "account",
      "field",
      "hybrid",
      "planted_on",
      "dug_at",
      "rep",
      "latitude_deg",
      "longitude_deg",
      "dig_root_index_0_100",
      "flagged_by_rep",
      "plant_id",
      "plant_position",
      "leaf_stage",
      "seeding_depth_in",
      "crown_depth_in",
      "mesocotyl",
      "seminal_score_0_5",
      "nodal_whorls",
      "nodal_root_count",
      "longest_nodal_root_in",
      "seminal_injury",
      "nodal_injury",
      "findings",
      "band_beside_in",
      "band_below_in",
      "plant_root_index_0_100",
      "notes",
    ];
    data = rows.map((r) =>
      [
        r.digId,
        r.accountName,
        r.fieldName,
        r.hybrid,
        r.plantedOn,
        isoDate(r.dugAt),
        r.repName,
        r.latitude,
        r.longitude,
        r.digRootIndex,
        r.flaggedByRep,
        r.id,
        r.position,
        r.leafStage,
        r.seedingDepthIn,
        r.crownDepthIn,
        r.mesocotyl,
        r.seminalScore,
        r.nodalWhorls,
        r.nodalCount,
        r.longestNodalIn,
        r.seminalInjury,
        r.nodalInjury,
        r.findings,
        r.bandBesideIn,
        r.bandBelowIn,
        r.rootIndex,
        r.notes,
      ].map(csvCell),
    );
  }

  const csv = Papa.unparse({ fields, data }, { newline: "\r\n", quotes: false, escapeFormulae: false });
  const slug = name.replace(/[^A-Za-z0-9]+/g, "-").replace(/^-|-$/g, "") || "export";
  const day = new Date().toISOString().slice(0, 10);
  return new Response(`${csv}\r\n`, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${kind}-${slug}-${day}.csv"`,
      "cache-control": "private, no-store",
    },
  });
});
