// The read side of injury cases through the real routes (issue 7 parts 1, 2 and 6): the queue's
// server-side sorting, filtering, paging and counts by status; who sees which cases; the evidence PDF
// and the CSV export. Each fixture region has its own supervisor, reps and grower (tests/helpers/sync.ts),
// so the demo's cases never enter the numbers.
import { randomUUID } from "node:crypto";
import { readFileSync } from "node:fs";
import path from "node:path";
import type { Kysely } from "kysely";
import { sql } from "kysely";
import Papa from "papaparse";
import { PDFParse } from "pdf-parse";
import { beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { CaseList } from "@/db/queries/case-view";
import type { Database } from "@/db/schema";
import type { Finding } from "@/lib/agronomy";
import { testEnv } from "../helpers/env";
import { type ApiClient, signedInAs } from "../helpers/session";
import {
  burntPlant,
  createSyncFixture,
  digPayload,
  photoPayload,
  SimDevice,
  type SyncFixture,
  signIn,
  uploadPhoto,
} from "../helpers/sync";

let db: Kysely<Database>;
let fx: SyncFixture;
let pages: SyncFixture;
const api = {} as Record<
  "supervisor" | "repA" | "repB" | "grower" | "demoSupervisor" | "admin" | "pagesSupervisor",
  ApiClient
>;

interface Spec {
  key: string;
  account: "shared" | "other";
  rep: "repA" | "repB";
  hybrid: "108" | "95" | null;
  severity: "critical" | "warning" | "caution";
  status: "new" | "in_review" | "decided" | "closed";
  ageDays: number;
  fieldName?: string;
}

// Six cases of one region, varied on every sortable column. Default queue order: undecided first,
// oldest first: c1 (10 d), c6 (6 d), c2 (3 d), c5 (1 d), then c4 (30 d), c3 (20 d).
const SPECS: Spec[] = [
  {
    key: "c1",
    account: "shared",
    rep: "repA",
    hybrid: "108",
    severity: "critical",
    status: "new",
    ageDays: 10,
  },
  {
    key: "c2",
    account: "shared",
    rep: "repA",
    hybrid: "108",
    severity: "warning",
    status: "in_review",
    ageDays: 3,
  },
  {
    key: "c3",
    account: "shared",
    rep: "repB",
    hybrid: "108",
    severity: "caution",
    status: "decided",
    ageDays: 20,
  },
  {
    key: "c4",
    account: "other",
    rep: "repB",
    hybrid: "95",
    severity: "critical",
    status: "closed",
    ageDays: 30,
  },
  {
    key: "c5",
    account: "other",
    rep: "repB",
    hybrid: "95",
    severity: "warning",
    status: "new",
    ageDays: 1,
    fieldName: '=HYPERLINK("http://example.test")',
  },
  { key: "c6", account: "shared", rep: "repA", hybrid: null, severity: "caution", status: "new", ageDays: 6 },
];
const ids = new Map<string, string>();
let sharedFieldName = "";
const keyOf = (id: string) => [...ids].find(([, v]) => v === id)?.[0] ?? id;
const HYBRID_95 = "fixture 95-day";

async function insertCase(spec: {
  accountId: string;
  fieldId: string;
  plantingId: string | null;
  repId: string;
  severity: Spec["severity"];
  status: Spec["status"];
  ageDays: number;
}) {
  const digId = randomUUID();
  await db
    .insertInto("digSite")
    .values({
      id: digId,
      fieldId: spec.fieldId,
      plantingId: spec.plantingId,
      accountId: spec.accountId,
      repId: spec.repId,
      dugAt: sql<Date>`now() - make_interval(days => ${spec.ageDays})`,
      latitude: 36.7,
      longitude: -119.6,
    })
    .execute();
  const decided = spec.status === "decided" || spec.status === "closed";
  const row = await db
    .insertInto("injuryCase")
    .values({
      digSiteId: digId,
      accountId: spec.accountId,
      severity: spec.severity,
      status: spec.status,
      decision: decided ? "not_injury" : null,
      decisionReason: decided ? "Cold stress, not the fertilizer band." : null,
      decidedAt: decided ? new Date() : null,
      createdBy: spec.repId,
      createdAt: sql<Date>`now() - make_interval(days => ${spec.ageDays}) - interval '1 hour'`,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  return row.id;
}

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  fx = await createSyncFixture(db, "caseview");
  pages = await createSyncFixture(db, "caseview-pages");
  api.supervisor = await signIn(fx.users.supervisor);
  api.repA = await signIn(fx.users.repA);
  api.repB = await signIn(fx.users.repB);
  api.grower = await signIn(fx.users.grower);
  api.pagesSupervisor = await signIn(pages.users.supervisor);
  api.demoSupervisor = await signedInAs("supervisor");
  api.admin = await signedInAs("admin");

  sharedFieldName = (
    await db.selectFrom("field").select("name").where("id", "=", fx.shared.fieldId).executeTakeFirstOrThrow()
  ).name;
  const planting95 = randomUUID();
  await db
    .insertInto("planting")
    .values({
      id: planting95,
      fieldId: fx.other.fieldId,
      accountId: fx.other.accountId,
      hybrid: HYBRID_95,
      plantedOn: "2026-04-25",
      seedingRate: 32_000,
      seedingDepthIn: 1.75,
      rowSpacingIn: 30,
      soilTexture: "medium",
    })
    .execute();
  for (const s of SPECS) {
    const account = s.account === "shared" ? fx.shared : fx.other;
    let fieldId = account.fieldId;
    if (s.fieldName) {
      fieldId = (
        await db
          .insertInto("field")
          .values({ accountId: account.accountId, name: s.fieldName, soilTexture: "medium" })
          .returning("id")
          .executeTakeFirstOrThrow()
      ).id;
    }
    const plantingId = s.hybrid === "108" ? fx.shared.plantingId : s.hybrid === "95" ? planting95 : null;
    ids.set(
      s.key,
      await insertCase({
        accountId: account.accountId,
        fieldId,
        plantingId,
        repId: fx.users[s.rep].id,
        severity: s.severity,
        status: s.status,
        ageDays: s.ageDays,
      }),
    );
  }
  return () => db.destroy();
});

// A refused case page answers a real 404 (its layout checks before the loading boundary streams) with
// the not-found page and nothing of the case in the document.
async function casePage(who: ApiClient, caseId: string | undefined) {
  const res = await who.fetch(`/cases/${caseId}`);
  const html = await res.text();
  return {
    status: res.status,
    refused: res.status === 404 && html.includes("Not found") && !html.includes(sharedFieldName),
    shown: html.includes(`Case: ${sharedFieldName}`),
    html,
  };
}

async function queue(who: ApiClient, query = "") {
  const res = await who.fetch(`/api/cases${query}`);
  const body = (await res.json()) as CaseList & { error?: string };
  return { status: res.status, body, keys: res.ok ? body.rows.map((r) => keyOf(r.id)) : [] };
}

describe("case queue: sorting, filtering, paging and counts", () => {
  it("puts undecided cases first, oldest first, and counts every status of the region", async () => {
    const { status, body, keys } = await queue(api.supervisor);
    expect(status).toBe(200);
    expect(keys).toEqual(["c1", "c6", "c2", "c5", "c4", "c3"]);
    expect(body.total).toBe(6);
    expect(body.counts).toEqual({ new: 3, in_review: 1, decided: 1, closed: 1 });
    const c1 = body.rows[0]!;
    expect(c1).toMatchObject({
      status: "new",
      severity: "critical",
      ageDays: 10,
      hybrid: "fixture 108-day",
      repName: expect.stringContaining("RepA"),
      accountName: expect.stringContaining("Sync Shared Farm"),
      fieldName: expect.stringContaining("Sync North"),
      assignedToName: null,
    });
  });

  it("sorts on the server by severity, hybrid, account and age, ties undecided and oldest first", async () => {
    expect((await queue(api.supervisor, "?sort=severity&dir=asc")).keys).toEqual([
      "c1",
      "c4",
      "c2",
      "c5",
      "c6",
      "c3",
    ]);
    expect((await queue(api.supervisor, "?sort=severity&dir=desc")).keys).toEqual([
      "c6",
      "c3",
      "c2",
      "c5",
      "c1",
      "c4",
    ]);
    // "fixture 108-day" sorts before "fixture 95-day"; no hybrid goes last.
    expect((await queue(api.supervisor, "?sort=hybrid&dir=asc")).keys).toEqual([
      "c1",
      "c2",
      "c3",
      "c5",
      "c4",
      "c6",
    ]);
    // "Sync Other Farm" before "Sync Shared Farm".
    expect((await queue(api.supervisor, "?sort=account&dir=asc")).keys).toEqual([
      "c5",
      "c4",
      "c1",
      "c6",
      "c2",
      "c3",
    ]);
    expect((await queue(api.supervisor, "?sort=opened&dir=desc")).keys).toEqual([
      "c5",
      "c2",
      "c6",
      "c1",
      "c3",
      "c4",
    ]);
    expect((await queue(api.supervisor, "?sort=status&dir=asc")).keys).toEqual([
      "c1",
      "c6",
      "c5",
      "c2",
      "c3",
      "c4",
    ]);
  });

  it("filters by status, severity, account, rep, hybrid and age; counts ignore only the status filter", async () => {
    const byStatus = await queue(api.supervisor, "?status=new");
    expect(byStatus.keys).toEqual(["c1", "c6", "c5"]);
    expect(byStatus.body.total).toBe(3);
    expect(byStatus.body.counts).toEqual({ new: 3, in_review: 1, decided: 1, closed: 1 });

    const critical = await queue(api.supervisor, "?severity=critical");
    expect(critical.keys).toEqual(["c1", "c4"]);
    expect(critical.body.counts).toEqual({ new: 1, in_review: 0, decided: 0, closed: 1 });

    expect((await queue(api.supervisor, `?account=${fx.other.accountId}`)).keys).toEqual(["c5", "c4"]);
    expect((await queue(api.supervisor, `?rep=${fx.users.repA.id}`)).keys).toEqual(["c1", "c6", "c2"]);
    expect((await queue(api.supervisor, `?hybrid=${encodeURIComponent(HYBRID_95)}`)).keys).toEqual([
      "c5",
      "c4",
    ]);
    expect((await queue(api.supervisor, "?minAge=5&maxAge=20")).keys).toEqual(["c1", "c6", "c3"]);
    expect((await queue(api.supervisor, "?status=new&severity=warning")).keys).toEqual(["c5"]);
  });

  it("refuses values it does not know", async () => {
    expect((await queue(api.supervisor, "?sort=colour")).status).toBe(422);
    expect((await queue(api.supervisor, "?status=lost")).status).toBe(422);
    expect((await queue(api.supervisor, "?account=not-a-uuid")).status).toBe(422);
  });

  it("pages without overlap, 25 to a page by default", async () => {
    const fieldId = pages.shared.fieldId;
    for (let i = 0; i < 27; i++) {
      await insertCase({
        accountId: pages.shared.accountId,
        fieldId,
        plantingId: null,
        repId: pages.users.repA.id,
        severity: "warning",
        status: i % 3 === 0 ? "decided" : "new",
        ageDays: i,
      });
    }
    const first = await queue(api.pagesSupervisor);
    const second = await queue(api.pagesSupervisor, "?page=2");
    expect(first.body.total).toBe(27);
    expect(first.body.rows).toHaveLength(25);
    expect(second.body.rows).toHaveLength(2);
    const all = [...first.body.rows, ...second.body.rows];
    expect(new Set(all.map((r) => r.id)).size).toBe(27);
    // The decided ones come last, and within each group the oldest first.
    const undecided = all.filter((r) => r.status === "new");
    expect(all.slice(0, undecided.length).every((r) => r.status === "new")).toBe(true);
    const ages = undecided.map((r) => r.ageDays);
    expect(ages).toEqual([...ages].sort((a, b) => b - a));
    const fifty = await queue(api.pagesSupervisor, "?pageSize=50");
    expect(fifty.body.rows).toHaveLength(27);
    expect(fifty.body.rows.map((r) => r.id)).toEqual(all.map((r) => r.id));
  });
});

describe("case queue: who sees which cases", () => {
  it("shows a supervisor of another region none of them", async () => {
    const mine = await queue(api.demoSupervisor, `?account=${fx.shared.accountId}`);
    expect(mine.status).toBe(200);
    expect(mine.body.total).toBe(0);
    expect(mine.body.counts).toEqual({ new: 0, in_review: 0, decided: 0, closed: 0 });
    expect((await casePage(api.demoSupervisor, ids.get("c1"))).refused).toBe(true);
    expect((await api.demoSupervisor.fetch(`/api/cases/${ids.get("c1")}/evidence`)).status).toBe(404);
  });

  it("shows a rep the cases of the accounts they serve only", async () => {
    const a = await queue(api.repA);
    expect(a.status).toBe(200);
    expect(a.keys).toEqual(["c1", "c6", "c2", "c3"]);
    expect(a.body.counts).toEqual({ new: 2, in_review: 1, decided: 1, closed: 0 });
    const b = await queue(api.repB);
    expect(b.keys).toEqual(["c1", "c6", "c2", "c5", "c4", "c3"]);
    const other = await casePage(api.repA, ids.get("c4"));
    expect(other.refused).toBe(true);
    expect(other.html).not.toContain("Sync Other Farm");
    const own = await casePage(api.repA, ids.get("c1"));
    expect(own.status).toBe(200);
    expect(own.shown).toBe(true);
  });

  it("gives a grower no queue, and a case page only once it is shared with them", async () => {
    expect((await api.grower.fetch("/api/cases")).status).toBe(403);
    expect((await api.grower.fetch("/api/cases/export")).status).toBe(403);
    expect((await api.grower.fetch("/cases")).status).toBe(404);
    expect((await casePage(api.grower, ids.get("c1"))).refused).toBe(true);
    await db
      .updateTable("injuryCase")
      .set({ sharedWithGrower: true })
      .where("id", "=", ids.get("c6")!)
      .execute();
    const shared = await casePage(api.grower, ids.get("c6"));
    expect(shared.status).toBe(200);
    expect(shared.shown).toBe(true);
    expect(shared.html).toContain("Your adviser shared this case with you");
  });

  it("answers 404 to a case id that is not a uuid, and 401 when signed out", async () => {
    expect((await casePage(api.supervisor, "not-a-case")).refused).toBe(true);
    expect((await api.supervisor.fetch("/api/cases/not-a-case/evidence")).status).toBe(404);
    const anonymous = await fetch(`${testEnv.appUrl}/api/cases`);
    expect(anonymous.status).toBe(401);
  });
});

describe("case exports", () => {
  it("exports the queue as CSV with the same filters and order, every page, formulas defused", async () => {
    const res = await api.supervisor.fetch("/api/cases/export?status=new");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("text/csv");
    expect(res.headers.get("content-disposition")).toMatch(
      /^attachment; filename="cases-\d{4}-\d{2}-\d{2}\.csv"$/,
    );
    const text = (await res.text()).replace(/^\uFEFF/, "");
    const parsed = Papa.parse<Record<string, string>>(text.trim(), { header: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data.map((r) => keyOf(r.case_id!))).toEqual(["c1", "c6", "c5"]);
    const c5 = parsed.data.find((r) => r.case_id === ids.get("c5"))!;
    expect(c5.field).toBe('\'=HYPERLINK("http://example.test")');
    expect(c5.hybrid).toBe(HYBRID_95);
    expect(c5.severity).toBe("warning");

    const many = await api.pagesSupervisor.fetch("/api/cases/export");
    const rows = Papa.parse<Record<string, string>>((await many.text()).replace(/^\uFEFF/, "").trim(), {
      header: true,
    }).data;
    expect(rows.length).toBeGreaterThanOrEqual(27);
  });

  it("writes the evidence PDF with the field, the photo hashes and the computed flag reasons", async () => {
    // A real burn dig with a JPEG photo, pushed by the rep: the server computes the assessment and
    // opens the case.
    const device = new SimDevice(await signIn(pages.users.repA), "pdf");
    const dig = digPayload(pages.shared.fieldId, pages.shared.plantingId, {
      recommendation: "Hold the side-dress until new nodal roots show.",
    });
    const bytes = readFileSync(path.resolve(import.meta.dirname, "..", "fixtures", "roots-landscape.jpg"));
    const photo = photoPayload(dig.id, bytes, { caption: "Burnt seminal roots" });
    await uploadPhoto(device.api, photo, bytes, pages.shared.fieldId);
    device.putDig(dig);
    device.putPlant(burntPlant(dig.id, 1));
    device.putPlant(burntPlant(dig.id, 2));
    device.putPhoto(photo);
    await device.sync();
    const opened = await db
      .selectFrom("injuryCase")
      .innerJoin("digSite", "digSite.id", "injuryCase.digSiteId")
      .select(["injuryCase.id", "digSite.assessment"])
      .where("injuryCase.digSiteId", "=", dig.id)
      .executeTakeFirstOrThrow();
    const flags = (opened.assessment as { flags: Finding[] }).flags;
    const burn = flags.find((f) => f.code === "root_burn_seen");
    expect(burn).toBeDefined();
    const fieldName = (
      await db
        .selectFrom("field")
        .select("name")
        .where("id", "=", pages.shared.fieldId)
        .executeTakeFirstOrThrow()
    ).name;

    const res = await api.pagesSupervisor.fetch(`/api/cases/${opened.id}/evidence`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(res.headers.get("content-disposition")).toContain("attachment");
    const data = new Uint8Array(await res.arrayBuffer());
    // The JPEG is printed: an image XObject is in the file (read before the parser takes the bytes).
    expect(Buffer.from(data).toString("latin1")).toMatch(/\/Subtype\s*\/Image/);
    const parser = new PDFParse({ data });
    const text = (await parser.getText()).text.replace(/\s+/g, " ");
    await parser.destroy();
    expect(text).toContain(fieldName);
    expect(text).toContain(photo.sha256);
    expect(text).toContain(burn!.message);
    expect(text).toContain("Hold the side-dress until new nodal roots show.");

    // The case page shows the same evidence to the supervisor, with a short-lived photo link.
    const page = await api.pagesSupervisor.fetch(`/cases/${opened.id}`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain(photo.sha256);
    expect(html).toMatch(/X-Amz-Expires=300/);
    expect(html).toContain("Fertilizer burn seen on the roots of 2 of 2 plants.");
  });
});
