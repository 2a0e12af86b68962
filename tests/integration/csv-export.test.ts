// CSV export of digs and dug plants, for a field or an account: the file parses back (RFC 4180) to
// exactly the database's rows, text with quotes, commas and line breaks survives, cells that would run
// as spreadsheet formulas are prefixed with an apostrophe, and other farms' records are 404. The
// fixture account in Sandhollow Valley is served by rep1 only, with two fields, three digs and five
// plants; it is removed afterwards.
import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database, NewDigSite } from "@/db/schema";
import { DEMO_USERS } from "@/db/seed/demo-users";
import { testEnv } from "../helpers/env";
import { type ApiClient, signedInAs } from "../helpers/session";

const suffix = randomUUID().slice(0, 8);
const TRICKY_NOTES = 'Crust "hard" near the pivot, east side\nsecond line';
const FORMULA_NOTES = '=HYPERLINK("http://example.test","click")';
const FORMULA_RECOMMENDATION = "+1 more dig next week";
const AT_RECOMMENDATION = "@grower call me";
const MINUS_HYBRID = `-${suffix} 102-day`;

let db: Kysely<Database>;
const fx = { accountId: "", fieldA: "", fieldB: "", digs: [] as string[] };

type Csv = { fields: string[]; rows: Record<string, string>[] };

async function getCsv(client: ApiClient, query: string): Promise<{ res: Response; csv: Csv }> {
  const res = await client.fetch(`/api/exports/digs?${query}`);
  const text = res.ok ? await res.text() : "";
  const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
  expect(parsed.errors).toEqual([]);
  return { res, csv: { fields: parsed.meta.fields ?? [], rows: parsed.data } };
}

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  const userId = async (key: string) =>
    (
      await db
        .selectFrom("appUser")
        .select("id")
        .where("email", "=", DEMO_USERS.find((u) => u.key === key)!.email)
        .executeTakeFirstOrThrow()
    ).id;
  const rep1 = await userId("rep1");
  const region = await db
    .selectFrom("region")
    .select("id")
    .where("name", "=", "Sandhollow Valley")
    .executeTakeFirstOrThrow();
  fx.accountId = (
    await db
      .insertInto("account")
      .values({ regionId: region.id, name: `CSV Fixture Farm ${suffix}` })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  await db.insertInto("accountRep").values({ accountId: fx.accountId, userId: rep1 }).execute();
  fx.fieldA = randomUUID();
  fx.fieldB = randomUUID();
  await db
    .insertInto("field")
    .values([
      { id: fx.fieldA, accountId: fx.accountId, name: `CSV East, pivot ${suffix}` },
      { id: fx.fieldB, accountId: fx.accountId, name: `CSV West ${suffix}` },
    ])
    .execute();
  const plantingA = randomUUID();
  const plantingB = randomUUID();
  const planting = (id: string, fieldId: string, hybrid: string) => ({
    id,
    fieldId,
    accountId: fx.accountId,
    hybrid,
    plantedOn: "2026-04-18",
    seedingRate: 33_000,
    seedingDepthIn: 1.75,
    rowSpacingIn: 30,
    soilTexture: "medium" as const,
  });
  await db
    .insertInto("planting")
    .values([
      planting(plantingA, fx.fieldA, `CSV ${suffix} 104-day`),
      planting(plantingB, fx.fieldB, MINUS_HYBRID),
    ])
    .execute();
  const dig = (fieldId: string, plantingId: string, dugAt: string, extra: Partial<NewDigSite>) => {
    const id = randomUUID();
    fx.digs.push(id);
    return {
      id,
      fieldId,
      plantingId,
      accountId: fx.accountId,
      repId: rep1,
      dugAt: new Date(dugAt),
      latitude: 36.512345,
      longitude: -119.654321,
      ...extra,
    };
  };
  const digs = [
    dig(fx.fieldA, plantingA, "2026-05-10T15:30:00Z", { rootIndex: 64.2, notes: TRICKY_NOTES }),
    dig(fx.fieldA, plantingA, "2026-05-17T16:00:00Z", {
      rootIndex: 70.9,
      notes: FORMULA_NOTES,
      recommendation: FORMULA_RECOMMENDATION,
    }),
    dig(fx.fieldB, plantingB, "2026-05-12T14:45:00Z", {
      rootIndex: null,
      recommendation: AT_RECOMMENDATION,
      flaggedByRep: true,
    }),
  ];
  await db.insertInto("digSite").values(digs).execute();
  const plant = (digSiteId: string, position: number, seedingDepthIn: number, rootIndex: number | null) => ({
    id: randomUUID(),
    digSiteId,
    position,
    leafStage: "V3",
    seedingDepthIn,
    crownDepthIn: 0.75,
    nodalCount: 6,
    rootIndex,
    findings: ["band_burn", "shallow_crown"],
  });
  await db
    .insertInto("dugPlant")
    .values([
      plant(digs[0]!.id, 0, 1.8, 63.5),
      plant(digs[0]!.id, 1, 1.6, 64.9),
      plant(digs[1]!.id, 0, 2.1, 70.9),
      plant(digs[2]!.id, 0, 1.4, null),
      plant(digs[2]!.id, 1, 1.5, null),
    ])
    .execute();
  // A deleted dig is not exported.
  const deleted = dig(fx.fieldA, plantingA, "2026-05-20T15:00:00Z", { deletedAt: new Date() });
  await db.insertInto("digSite").values(deleted).execute();
});

afterAll(async () => {
  await db.deleteFrom("dugPlant").where("digSiteId", "in", fx.digs).execute();
  await db.deleteFrom("digSite").where("id", "in", fx.digs).execute();
  await db.deleteFrom("planting").where("accountId", "=", fx.accountId).execute();
  await db.deleteFrom("field").where("accountId", "=", fx.accountId).execute();
  await db.deleteFrom("accountRep").where("accountId", "=", fx.accountId).execute();
  await db.deleteFrom("account").where("id", "=", fx.accountId).execute();
  await db.destroy();
});

describe("CSV export of digs and plants", () => {
  let rep1: ApiClient;
  let rep2: ApiClient;
  let grower1: ApiClient;

  beforeAll(async () => {
    [rep1, rep2, grower1] = await Promise.all([
      signedInAs("rep1"),
      signedInAs("rep2"),
      signedInAs("grower1"),
    ]);
  });

  it("exports one row per live dig of a field, matching the database, as an attachment", async () => {
    const { res, csv } = await getCsv(rep1, `fieldId=${fx.fieldA}`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="digs-.+\.csv"$/);
    expect(csv.fields).toContain("root_index_0_100");
    expect(csv.fields).toContain("dug_at");

    const expected = await db
      .selectFrom("digSite")
      .select(["id", "dugAt", "rootIndex", "latitude", "notes"])
      .select((eb) =>
        eb
          .selectFrom("dugPlant")
          .select((e) => e.fn.countAll<string>().as("n"))
          .whereRef("dugPlant.digSiteId", "=", "digSite.id")
          .as("plants"),
      )
      .where("fieldId", "=", fx.fieldA)
      .where("deletedAt", "is", null)
      .orderBy("dugAt")
      .execute();
    expect(csv.rows.map((r) => r.dig_id)).toEqual(expected.map((d) => d.id));
    csv.rows.forEach((row, i) => {
      const d = expected[i]!;
      expect(row.dug_at).toBe(d.dugAt.toISOString());
      expect(Number(row.root_index_0_100)).toBe(d.rootIndex);
      expect(Number(row.latitude_deg)).toBe(d.latitude);
      expect(Number(row.plants_dug)).toBe(Number(d.plants));
      expect(row.field).toBe(`CSV East, pivot ${suffix}`);
    });
    // Quotes, commas and line breaks come back as typed.
    expect(csv.rows[0]!.notes).toBe(TRICKY_NOTES);
  });

  it("guards cells that would run as formulas with a leading apostrophe", async () => {
    const { csv } = await getCsv(rep1, `accountId=${fx.accountId}`);
    const byNotes = csv.rows.find((r) => r.notes?.includes("HYPERLINK"));
    expect(byNotes!.notes).toBe(`'${FORMULA_NOTES}`);
    expect(byNotes!.recommendation).toBe(`'${FORMULA_RECOMMENDATION}`);
    const flagged = csv.rows.find((r) => r.flagged_by_rep === "true");
    expect(flagged!.recommendation).toBe(`'${AT_RECOMMENDATION}`);
    expect(flagged!.hybrid).toBe(`'${MINUS_HYBRID}`);
    // Numbers (a negative longitude) stay numbers.
    expect(flagged!.longitude_deg).toBe("-119.654321");
    for (const row of csv.rows) {
      for (const value of Object.values(row)) expect(value).not.toMatch(/^[=+@]/);
    }
  });

  it("exports one row per dug plant of an account with its dig's columns and units in the headers", async () => {
    const { res, csv } = await getCsv(rep1, `accountId=${fx.accountId}&kind=plants`);
    expect(res.status).toBe(200);
    expect(csv.fields).toEqual(
      expect.arrayContaining(["seeding_depth_in", "crown_depth_in", "plant_root_index_0_100"]),
    );
    const expected = await db
      .selectFrom("dugPlant")
      .innerJoin("digSite", "digSite.id", "dugPlant.digSiteId")
      .select([
        "dugPlant.id",
        "dugPlant.digSiteId",
        "dugPlant.seedingDepthIn",
        "dugPlant.rootIndex",
        "digSite.dugAt",
      ])
      .where("digSite.accountId", "=", fx.accountId)
      .where("digSite.deletedAt", "is", null)
      .orderBy("digSite.dugAt")
      .orderBy("dugPlant.position")
      .execute();
    expect(csv.rows.map((r) => r.plant_id)).toEqual(expected.map((p) => p.id));
    csv.rows.forEach((row, i) => {
      const p = expected[i]!;
      expect(row.dig_id).toBe(p.digSiteId);
      expect(Number(row.seeding_depth_in)).toBe(p.seedingDepthIn);
      expect(row.plant_root_index_0_100).toBe(p.rootIndex === null ? "" : String(p.rootIndex));
      expect(row.dug_at).toBe(p.dugAt.toISOString());
      expect(row.findings).toBe("band_burn;shallow_crown");
    });
  });

  it("answers 404 for another farm's field or account, and 400 without a scope", async () => {
    expect((await rep2.fetch(`/api/exports/digs?fieldId=${fx.fieldA}`)).status).toBe(404);
    expect((await rep2.fetch(`/api/exports/digs?accountId=${fx.accountId}&kind=plants`)).status).toBe(404);
    expect((await grower1.fetch(`/api/exports/digs?fieldId=${fx.fieldB}`)).status).toBe(404);
    expect((await rep1.fetch("/api/exports/digs?fieldId=not-a-uuid")).status).toBe(404);
    expect((await rep1.fetch(`/api/exports/digs?fieldId=${randomUUID()}`)).status).toBe(404);
    expect((await rep1.fetch("/api/exports/digs")).status).toBe(400);
    expect((await rep1.fetch(`/api/exports/digs?fieldId=${fx.fieldA}&kind=photos`)).status).toBe(400);
  });
});
