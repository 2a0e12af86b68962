import { NextResponse } from "next/server";
import { z } from "zod";
import { findAccountAccess } from "@/db/queries/access";
import { findField } from "@/db/queries/fields";
import { importFieldWeather } from "@/db/queries/weather";
import { can, refusalStatus } from "@/lib/auth/permissions";
import { authenticate, forbidden, handle, jsonError, notFoundJson, parseJson } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";
import { parseWeatherCsv } from "@/lib/weather/csv";

type Ctx = { params: Promise<{ id: string }> };

// A CSV of a few years of days is far below this.
const MAX_CSV_BYTES = 1024 * 1024;
// The answer lists this many row errors at most, with the total.
const MAX_LISTED_ERRORS = 100;

const unitSchema = z.enum(["F", "C"]).default("F");
const weatherJsonSchema = z.object({ csv: z.string().min(1), unit: unitSchema });

type Body = { ok: true; csv: string; unit: "F" | "C" } | { ok: false; response: Response };

async function readBody(req: Request): Promise<Body> {
  const type = req.headers.get("content-type") ?? "";
  if (type.includes("application/json")) {
    const parsed = await parseJson(req, weatherJsonSchema, MAX_CSV_BYTES + 1024);
    return parsed.ok ? { ok: true, ...parsed.data } : parsed;
  }
  if (!type.includes("text/csv") && !type.includes("text/plain")) {
    return { ok: false, response: jsonError(415, "Send the file as text/csv or as JSON { csv }.") };
  }
  const tooLarge = () => jsonError(413, `The file is larger than ${MAX_CSV_BYTES / 1024 / 1024} MB.`);
  if (Number(req.headers.get("content-length") ?? "0") > MAX_CSV_BYTES)
    return { ok: false, response: tooLarge() };
  const csv = await req.text();
  if (Buffer.byteLength(csv) > MAX_CSV_BYTES) return { ok: false, response: tooLarge() };
  const unit = unitSchema.safeParse(new URL(req.url).searchParams.get("unit") ?? undefined);
  if (!unit.success) return { ok: false, response: jsonError(422, "The unit must be F or C.") };
  return { ok: true, csv, unit: unit.data };
}

// Imports a file of daily temperatures into the field's weather station: every row or, when any row
// is wrong, nothing, with every row error listed.
export const POST = handle<Ctx>("POST /api/fields/[id]/weather", async (req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("field");
  const field = await findField(id);
  const access = field && (await findAccountAccess(auth.user, field.accountId));
  if (!field || !access) return notFoundJson("field");
  const resource = { kind: "field", access } as const;
  if (!can(auth.user, "write", resource)) {
    return refusalStatus(auth.user, resource) === 403 ? forbidden() : notFoundJson("field");
  }
  const body = await readBody(req);
  if (!body.ok) return body.response;
  const parsed = parseWeatherCsv(body.csv, body.unit);
  if (!parsed.ok) {
    return NextResponse.json(
      {
        error: "The file has errors; nothing was imported.",
        rowErrors: parsed.errors.slice(0, MAX_LISTED_ERRORS),
        errorCount: parsed.errors.length,
      },
      { status: 422 },
    );
  }
  const result = await importFieldWeather(
    id,
    parsed.rows.map(({ date, maxF, minF }) => ({ date, maxF, minF })),
    { regionId: access.regionId, actorId: auth.user.id },
  );
  if (!result.ok) {
    return result.reason === "noField"
      ? notFoundJson("field")
      : NextResponse.json(
          {
            error: "The field has no location for a weather station; add its boundary first.",
            code: "noLocation",
          },
          { status: 422 },
        );
  }
  const dates = parsed.rows.map((r) => r.date).sort();
  return NextResponse.json({
    imported: result.imported,
    replaced: result.replaced,
    stationId: result.stationId,
    stationName: result.stationName,
    createdStation: result.createdStation,
    firstDay: dates[0],
    lastDay: dates.at(-1),
    unit: parsed.unit,
  });
});
