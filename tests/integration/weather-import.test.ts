// Weather CSV import through the real route handler: a good file lands in PostgreSQL (with an on-farm
// station created and linked by a versioned field update), a bad file imports nothing and names its
// rows, and only a rep serving the farm (or an admin) may import. Fixture farm and fields of our own.
import { randomUUID } from "node:crypto";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { DEMO_USERS } from "@/db/seed/demo-users";
import { testEnv } from "../helpers/env";
import { ApiClient, signedInAs } from "../helpers/session";

const suffix = randomUUID().slice(0, 8);
let db: Kysely<Database>;
const fx = { accountId: "", goodFieldId: "", badFieldId: "", stationIds: [] as string[] };

const userId = async (key: string) => {
  const email = DEMO_USERS.find((u) => u.key === key)!.email;
  return (await db.selectFrom("appUser").select("id").where("email", "=", email).executeTakeFirstOrThrow())
    .id;
};

async function createField(name: string): Promise<string> {
  const id = randomUUID();
  await db
    .insertInto("field")
    .values({ id, accountId: fx.accountId, name, centroidLat: 36.71, centroidLon: -119.42 })
    .execute();
  return id;
}

const post = (client: ApiClient, fieldId: string, csv: string) =>
  client.fetch(`/api/fields/${fieldId}/weather`, {
    method: "POST",
    headers: { "content-type": "text/csv" },
    body: csv,
  });

// Every weather row in the database, as text, to show a refused file changed nothing anywhere.
async function weatherSnapshot(): Promise<string> {
  const rows = await db
    .selectFrom("weatherDaily")
    .select(["stationId", "day", "maxF", "minF", "version"])
    .orderBy("stationId")
    .orderBy("day")
    .execute();
  return JSON.stringify(rows);
}

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  const region = await db
    .selectFrom("region")
    .select("id")
    .where("name", "=", "Sandhollow Valley")
    .executeTakeFirstOrThrow();
  fx.accountId = (
    await db
      .insertInto("account")
      .values({ regionId: region.id, name: `Weather Fixture Farm ${suffix}` })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  await db
    .insertInto("accountRep")
    .values({ accountId: fx.accountId, userId: await userId("rep1") })
    .execute();
  await db
    .insertInto("accountGrower")
    .values({ accountId: fx.accountId, userId: await userId("grower1") })
    .execute();
  fx.goodFieldId = await createField(`Weather good ${suffix}`);
  fx.badFieldId = await createField(`Weather bad ${suffix}`);
});

afterAll(async () => {
  const fieldIds = [fx.goodFieldId, fx.badFieldId].filter(Boolean);
  const stations = fieldIds.length
    ? await db.selectFrom("field").select("weatherStationId").where("id", "in", fieldIds).execute()
    : [];
  const stationIds = [...fx.stationIds, ...stations.map((s) => s.weatherStationId)].filter(
    (s): s is string => s !== null,
  );
  if (fieldIds.length) await db.deleteFrom("field").where("id", "in", fieldIds).execute();
  if (stationIds.length) await db.deleteFrom("weatherStation").where("id", "in", stationIds).execute();
  if (fx.accountId) {
    await db.deleteFrom("accountRep").where("accountId", "=", fx.accountId).execute();
    await db.deleteFrom("accountGrower").where("accountId", "=", fx.accountId).execute();
    await db.deleteFrom("account").where("id", "=", fx.accountId).execute();
  }
  await db.destroy();
});

describe("POST /api/fields/[id]/weather", () => {
  it("imports a good file into a new on-farm station linked by a versioned field update", async () => {
    const rep = await signedInAs("rep1");
    const before = await db
      .selectFrom("field")
      .select(["version", "weatherStationId"])
      .where("id", "=", fx.goodFieldId)
      .executeTakeFirstOrThrow();
    expect(before.weatherStationId).toBeNull();

    const res = await post(
      rep,
      fx.goodFieldId,
      "date,max,min\n2026-05-01,78,51\n2026-05-02,81.5,54\n2026-05-03,70,50\n",
    );
    expect(res.status).toBe(200);
    const body = (await res.json()) as { imported: number; createdStation: boolean; stationId: string };
    expect(body).toMatchObject({ imported: 3, createdStation: true, replaced: 0 });

    const field = await db
      .selectFrom("field")
      .select(["version", "weatherStationId", "fieldVersions", "centroidLat", "centroidLon"])
      .where("id", "=", fx.goodFieldId)
      .executeTakeFirstOrThrow();
    expect(field.weatherStationId).toBe(body.stationId);
    expect(field.version).toBeGreaterThan(before.version);
    expect((field.fieldVersions as Record<string, number>).weatherStationId).toBe(field.version);
    const station = await db
      .selectFrom("weatherStation")
      .innerJoin("region", "region.id", "weatherStation.regionId")
      .select([
        "weatherStation.name",
        "weatherStation.latitude",
        "weatherStation.longitude",
        "region.name as region",
      ])
      .where("weatherStation.id", "=", body.stationId)
      .executeTakeFirstOrThrow();
    expect(station).toEqual({
      name: `Weather good ${suffix} on-farm`,
      latitude: field.centroidLat,
      longitude: field.centroidLon,
      region: "Sandhollow Valley",
    });
    const rows = await db
      .selectFrom("weatherDaily")
      .select(["day", "maxF", "minF", "version"])
      .where("stationId", "=", body.stationId)
      .orderBy("day")
      .execute();
    expect(rows).toEqual([
      { day: "2026-05-01", maxF: 78, minF: 51, version: field.version },
      { day: "2026-05-02", maxF: 81.5, minF: 54, version: field.version },
      { day: "2026-05-03", maxF: 70, minF: 50, version: field.version },
    ]);

    // A second file (JSON, °C) overwrites the days it names into the same station.
    const again = await rep.json(`/api/fields/${fx.goodFieldId}/weather`, "POST", {
      csv: "date,max,min\n2026-05-03,25,15\n2026-05-04,30,10\n",
      unit: "C",
    });
    expect(again.status).toBe(200);
    expect(await again.json()).toMatchObject({
      imported: 2,
      replaced: 1,
      createdStation: false,
      stationId: body.stationId,
    });
    const may3 = await db
      .selectFrom("weatherDaily")
      .select(["maxF", "minF"])
      .where("stationId", "=", body.stationId)
      .where("day", "in", ["2026-05-03", "2026-05-04"])
      .orderBy("day")
      .execute();
    expect(may3).toEqual([
      { maxF: 77, minF: 59 },
      { maxF: 86, minF: 50 },
    ]);
  });

  it("refuses a bad file with every row error and imports nothing", async () => {
    const rep = await signedInAs("rep1");
    const before = await weatherSnapshot();
    const stationsBefore = await db.selectFrom("weatherStation").select("id").execute();
    const csv = [
      "date,max,min",
      "2026-05-01,78,51",
      "2026-02-30,70,50",
      "2026-05-03,71,50",
      "2026-05-01,72,50",
      "2026-05-05,140,50",
      "2026-05-06,45,52",
    ].join("\n");
    const res = await rep.json(`/api/fields/${fx.badFieldId}/weather`, "POST", { csv });
    expect(res.status).toBe(422);
    const body = (await res.json()) as { rowErrors: { row: number; message: string }[]; errorCount: number };
    expect(body.errorCount).toBe(4);
    expect(body.rowErrors.map((e) => e.message)).toEqual([
      "Row 3: date 2026-02-30 is not a date",
      "Row 5: date 2026-05-01 is already on row 2",
      "Row 6: max 140 is outside the plausible range -60 to 130 °F",
      "Row 7: max 45 is below min 52",
    ]);
    expect(await weatherSnapshot()).toBe(before);
    expect(await db.selectFrom("weatherStation").select("id").execute()).toHaveLength(stationsBefore.length);
    const field = await db
      .selectFrom("field")
      .select("weatherStationId")
      .where("id", "=", fx.badFieldId)
      .executeTakeFirstOrThrow();
    expect(field.weatherStationId).toBeNull();
  });

  it("answers 403 to the farm's grower, 404 to a rep of another farm and for a non-uuid id, 401 signed out", async () => {
    const good = "date,max,min\n2026-06-01,80,55\n";
    const before = await weatherSnapshot();
    expect((await post(await signedInAs("grower1"), fx.badFieldId, good)).status).toBe(403);
    expect((await post(await signedInAs("rep2"), fx.badFieldId, good)).status).toBe(404);
    expect((await post(await signedInAs("grower3"), fx.badFieldId, good)).status).toBe(404);
    expect((await post(await signedInAs("rep1"), "not-a-uuid", good)).status).toBe(404);
    expect((await post(new ApiClient(), fx.badFieldId, good)).status).toBe(401);
    expect(await weatherSnapshot()).toBe(before);
  });

  it("lets an admin import, and refuses a body over 1 MB and other content types", async () => {
    const admin = await signedInAs("admin");
    const big = `date,max,min\n${"2026-05-01,70,50\n".repeat(70_000)}`;
    expect((await post(admin, fx.badFieldId, big)).status).toBe(413);
    const form = await admin.fetch(`/api/fields/${fx.badFieldId}/weather`, {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: "csv=x",
    });
    expect(form.status).toBe(415);
    const ok = await post(admin, fx.badFieldId, "max_f,min_f,date\n80,55,2026-06-01\n");
    expect(ok.status).toBe(200);
    expect(await ok.json()).toMatchObject({ imported: 1, createdStation: true });
  });
});
