// Supervisor review of injury cases through the real route handlers (issue 7): who may see and do
// what, a decision needs a reason, the full path new → in review → assigned → decided → closed →
// reopened writes one event per step in order, stale versions are refused with the current state,
// the audit trail refuses UPDATE, DELETE and TRUNCATE from the application's own database role, and
// the three e-mails (new case, decision, shared) reach the SMTP fake with links back to the case.
// The case is opened by a real sync push in a fixture region of its own (tests/helpers/sync.ts); the
// demo supervisor belongs to another region.
import type { Kysely } from "kysely";
import { sql } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { DEMO_USERS } from "@/db/seed/demo-users";
import { testEnv } from "../helpers/env";
import { type CaughtMail, mailTo, waitForMail } from "../helpers/mailbox";
import { ApiClient, signedInAs } from "../helpers/session";
import {
  burntPlant,
  createSyncFixture,
  digPayload,
  SimDevice,
  type SyncFixture,
  signIn,
} from "../helpers/sync";

type Who = "repA" | "repB" | "supervisor" | "grower";

interface CaseBody {
  id: string;
  status: string;
  decision: string | null;
  decisionReason: string | null;
  assignedTo: string | null;
  sharedWithGrower: boolean;
  decidedAt: string | null;
  version: number;
}
interface EventBody {
  id: string;
  kind: string;
  actor: { id: string; name: string } | null;
  body: string | null;
  payload: Record<string, unknown>;
}

let db: Kysely<Database>;
let fx: SyncFixture;
const api = {} as Record<Who, ApiClient>;
let otherSupervisor: ApiClient;
let otherRep: ApiClient;

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  fx = await createSyncFixture(db, "cases");
  for (const key of ["repA", "repB", "supervisor", "grower"] as const) api[key] = await signIn(fx.users[key]);
  otherSupervisor = await signedInAs("supervisor");
  otherRep = await signedInAs("rep1");
});

afterAll(async () => {
  await db.destroy();
});

/** A burnt dig pushed by the fixture's repA: the server opens its case. */
async function openCase(f: SyncFixture = fx, repA: ApiClient = api.repA): Promise<string> {
  const device = new SimDevice(repA, "repA");
  const dig = digPayload(f.shared.fieldId, f.shared.plantingId);
  device.putDig(dig);
  for (const n of [1, 2, 3]) device.putPlant(burntPlant(dig.id, n));
  const answer = await device.push();
  expect(answer.status).toBe(200);
  const row = await db
    .selectFrom("injuryCase")
    .select("id")
    .where("digSiteId", "=", dig.id)
    .executeTakeFirstOrThrow();
  return row.id;
}

const caseRow = (id: string) =>
  db.selectFrom("injuryCase").selectAll().where("id", "=", id).executeTakeFirstOrThrow();
const eventRows = (id: string) =>
  db.selectFrom("injuryCaseEvent").selectAll().where("caseId", "=", id).orderBy("id").execute();

async function act(who: ApiClient, caseId: string, body: Record<string, unknown>) {
  const res = await who.json(`/api/cases/${caseId}/events`, "POST", body);
  return { status: res.status, body: (await res.json()) as Record<string, unknown> };
}

async function timeline(who: ApiClient, caseId: string) {
  const res = await who.fetch(`/api/cases/${caseId}/events`);
  return {
    status: res.status,
    body: (await res.json()) as { case: CaseBody; role: string; events: EventBody[] },
  };
}

async function version(caseId: string) {
  return (await caseRow(caseId)).version;
}

describe("who sees and does what", () => {
  let caseId: string;
  beforeAll(async () => {
    caseId = await openCase();
  });

  it("the region's supervisor and the account's rep read the timeline; the opened event is first", async () => {
    const sup = await timeline(api.supervisor, caseId);
    expect(sup.status).toBe(200);
    expect(sup.body.role).toBe("decider");
    expect(sup.body.case).toMatchObject({ id: caseId, status: "new", sharedWithGrower: false });
    expect(sup.body.events.map((e) => e.kind)).toEqual(["opened"]);
    const rep = await timeline(api.repA, caseId);
    expect(rep.status).toBe(200);
    expect(rep.body.role).toBe("commenter");
    const admin = await timeline(await signedInAs("admin"), caseId);
    expect(admin.status).toBe(200);
    expect(admin.body.role).toBe("decider");
  });

  it("a supervisor of another region, a rep of other farms and the grower before sharing get 404", async () => {
    for (const who of [otherSupervisor, otherRep, api.grower]) {
      expect((await timeline(who, caseId)).status).toBe(404);
      const tried = await act(who, caseId, {
        action: "start_review",
        expectedVersion: await version(caseId),
      });
      expect(tried.status).toBe(404);
    }
    expect((await caseRow(caseId)).status).toBe("new");
  });

  it("a rep of the account cannot decide (403) and nothing changes", async () => {
    const before = await caseRow(caseId);
    const tried = await act(api.repA, caseId, {
      action: "decide",
      decision: "injury_confirmed",
      reason: "Burn on every plant along the band.",
      expectedVersion: before.version,
    });
    expect(tried.status).toBe(403);
    expect(await caseRow(caseId)).toEqual(before);
    expect((await eventRows(caseId)).map((e) => e.kind)).toEqual(["opened"]);
  });

  it("a rep of the account can comment, which changes only the timeline", async () => {
    const before = await caseRow(caseId);
    const posted = await act(api.repA, caseId, {
      action: "comment",
      body: "Grower says the 10-34-0 went on with the seed.",
      expectedVersion: before.version,
    });
    expect(posted.status).toBe(201);
    expect(posted.body.event).toMatchObject({
      kind: "comment",
      body: "Grower says the 10-34-0 went on with the seed.",
      actor: { id: fx.users.repA.id },
    });
    expect(await caseRow(caseId)).toEqual(before);
  });

  it("a decision without a reason, or with a short one, is refused (422) and changes nothing", async () => {
    const before = await caseRow(caseId);
    const events = await eventRows(caseId);
    for (const reason of [undefined, "", "burnt"]) {
      const tried = await act(api.supervisor, caseId, {
        action: "decide",
        decision: "injury_confirmed",
        ...(reason === undefined ? {} : { reason }),
        expectedVersion: before.version,
      });
      expect(tried.status).toBe(422);
      expect(tried.body.issues).toEqual([{ path: "reason", message: expect.any(String) }]);
    }
    expect(await caseRow(caseId)).toEqual(before);
    expect(await eventRows(caseId)).toEqual(events);
  });

  it("signed out is 401; a malformed case id is 404; an unknown id is 404", async () => {
    const anonymous = new ApiClient();
    expect((await timeline(anonymous, caseId)).status).toBe(401);
    expect((await timeline(api.supervisor, "not-a-uuid")).status).toBe(404);
    expect((await act(api.supervisor, "not-a-uuid", { action: "close", expectedVersion: 1 })).status).toBe(
      404,
    );
    expect((await timeline(api.supervisor, "00000000-0000-4000-8000-000000000000")).status).toBe(404);
  });

  it("an assignee must be an active supervisor of the case's region", async () => {
    const v = await version(caseId);
    const demoSupervisor = DEMO_USERS.find((u) => u.key === "supervisor")!;
    const other = await db
      .selectFrom("appUser")
      .select("id")
      .where("email", "=", demoSupervisor.email)
      .executeTakeFirstOrThrow();
    for (const userId of [fx.users.repB.id, other.id]) {
      const tried = await act(api.supervisor, caseId, { action: "assign", userId, expectedVersion: v });
      expect(tried.status).toBe(422);
      expect(tried.body.issues).toEqual([{ path: "userId", message: expect.any(String) }]);
    }
    expect((await caseRow(caseId)).assignedTo).toBeNull();
  });
});

describe("the full path", () => {
  let caseId: string;
  beforeAll(async () => {
    caseId = await openCase();
  });

  it("new → in review → assigned → decided → closed → reopened writes one event per step, in order", async () => {
    const steps: Record<string, unknown>[] = [
      { action: "start_review" },
      { action: "assign", userId: fx.users.supervisor.id },
      { action: "decide", decision: "inconclusive", reason: "Lab sample sent for salt analysis." },
      { action: "close" },
      { action: "reopen", reason: "The lab found a high salt load at the band." },
    ];
    const versions: number[] = [await version(caseId)];
    for (const step of steps) {
      const done = await act(api.supervisor, caseId, { ...step, expectedVersion: versions.at(-1) });
      expect(done.status, JSON.stringify(done.body)).toBe(201);
      const c = done.body.case as CaseBody;
      versions.push(c.version);
      expect(await version(caseId)).toBe(c.version);
    }
    // Each step took a new sync version of the region.
    for (let i = 1; i < versions.length; i++) expect(versions[i]!).toBeGreaterThan(versions[i - 1]!);

    const events = await eventRows(caseId);
    expect(events.map((e) => [e.kind, e.actorId])).toEqual([
      ["opened", fx.users.repA.id],
      ["status", fx.users.supervisor.id],
      ["assigned", fx.users.supervisor.id],
      ["decision", fx.users.supervisor.id],
      ["status", fx.users.supervisor.id],
      ["reopened", fx.users.supervisor.id],
    ]);
    expect(events.slice(1).map((e) => e.payload)).toEqual([
      { from: "new", to: "in_review" },
      { status: "in_review", from: null, to: fx.users.supervisor.id },
      { from: "in_review", to: "decided", decision: "inconclusive" },
      { from: "decided", to: "closed" },
      { from: "closed", to: "in_review", previousDecision: "inconclusive" },
    ]);
    expect(events[3]!.body).toBe("Lab sample sent for salt analysis.");
    expect(events[5]!.body).toBe("The lab found a high salt load at the band.");
    expect(await caseRow(caseId)).toMatchObject({
      status: "in_review",
      decision: null,
      decisionReason: null,
      decidedAt: null,
      assignedTo: fx.users.supervisor.id,
    });

    const shown = await timeline(api.repA, caseId);
    expect(shown.body.events.map((e) => e.kind)).toEqual(events.map((e) => e.kind));
  });

  it("a stale expectedVersion is refused (409) with the current case, and nothing is written", async () => {
    const current = await caseRow(caseId);
    const events = await eventRows(caseId);
    const tried = await act(api.supervisor, caseId, {
      action: "decide",
      decision: "injury_confirmed",
      reason: "Salt load at the band is over the limit.",
      expectedVersion: current.version - 1,
    });
    expect(tried.status).toBe(409);
    expect(tried.body.case).toMatchObject({ id: caseId, status: "in_review", version: current.version });
    expect(await caseRow(caseId)).toEqual(current);
    expect(await eventRows(caseId)).toEqual(events);
  });

  it("an action the status does not allow is refused (409) with the current case", async () => {
    const current = await caseRow(caseId);
    const tried = await act(api.supervisor, caseId, { action: "close", expectedVersion: current.version });
    expect(tried.status).toBe(409);
    expect(tried.body.error).toMatch(/decide/i);
    expect(tried.body.case).toMatchObject({ status: "in_review", version: current.version });
    expect(await caseRow(caseId)).toEqual(current);
  });
});

describe("the audit trail in PostgreSQL", () => {
  // The application's own credentials, as the app connects.
  let appDb: Kysely<Database>;
  let caseId: string;
  beforeAll(async () => {
    appDb = createDb(testEnv.databaseUrl, 1);
    caseId = await openCase();
    const done = await act(api.supervisor, caseId, {
      action: "comment",
      body: "Written once, kept as written.",
      expectedVersion: 0,
    });
    expect(done.status).toBe(201);
  });
  afterAll(async () => {
    await appDb.destroy();
  });

  // Refused by privilege (the role holds no UPDATE, DELETE or TRUNCATE) or else by the trigger.
  const refused = /permission denied|append-only/;

  it("refuses UPDATE, DELETE and TRUNCATE of event rows from the application's role", async () => {
    const before = await eventRows(caseId);
    const comment = before.find((e) => e.kind === "comment")!;
    await expect(
      appDb.updateTable("injuryCaseEvent").set({ body: "rewritten" }).where("id", "=", comment.id).execute(),
    ).rejects.toThrow(refused);
    await expect(
      sql`update injury_case_event set actor_id = null where case_id = ${caseId}`.execute(appDb),
    ).rejects.toThrow(refused);
    await expect(appDb.deleteFrom("injuryCaseEvent").where("caseId", "=", caseId).execute()).rejects.toThrow(
      refused,
    );
    await expect(sql`truncate injury_case_event`.execute(appDb)).rejects.toThrow(refused);
    expect(await eventRows(caseId)).toEqual(before);
  });

  it("does not let the application's role switch the trigger off: it does not own the table", async () => {
    const before = await eventRows(caseId);
    await expect(sql`alter table injury_case_event disable trigger all`.execute(appDb)).rejects.toThrow(
      /must be owner/,
    );
    await expect(appDb.deleteFrom("injuryCaseEvent").where("caseId", "=", caseId).execute()).rejects.toThrow(
      refused,
    );
    expect(await eventRows(caseId)).toEqual(before);
  });
});

describe("e-mail", () => {
  const linkOf = (mail: CaughtMail) => {
    const match = mail.text.match(/https?:\/\/\S+\/cases\/[0-9a-f-]{36}/);
    if (!match) throw new Error(`no case link in "${mail.subject}"`);
    return new URL(match[0]);
  };
  // The link points at the case page of this app, and opens it for the person it was sent to.
  const expectLinkTo = async (mail: CaughtMail, caseId: string, reader: ApiClient) => {
    const link = linkOf(mail);
    expect(link.origin).toBe(new URL(testEnv.appUrl).origin);
    expect(link.pathname).toBe(`/cases/${caseId}`);
    expect(mail.html).toContain(`href="${link.href}"`);
    const page = await reader.fetch(link.pathname);
    expect(page.status, `${link.pathname} for ${mail.to[0]?.address}`).toBe(200);
    expect(await page.text()).toContain(`Sync Shared Farm ${mf.suffix}`);
  };

  // A fixture of its own, so these people get no other case's e-mail.
  let mf: SyncFixture;
  const mapi = {} as Record<Who, ApiClient>;
  beforeAll(async () => {
    mf = await createSyncFixture(db, "case-mail");
    for (const key of ["repA", "supervisor", "grower"] as const) mapi[key] = await signIn(mf.users[key]);
  });

  it("the region's supervisor gets the new case, the rep the decision, the grower the shared case; each link opens the case", async () => {
    const demoSupervisor = DEMO_USERS.find((u) => u.key === "supervisor")!;
    const elsewhereBefore = (await mailTo(demoSupervisor.email)).length;
    const caseId = await openCase(mf, mapi.repA);

    const [opened] = await waitForMail(mf.users.supervisor.email, 1);
    expect(opened!.subject).toMatch(/New burn case \(critical\)/);
    expect(opened!.text).toContain("Sync Shared Farm");
    await expectLinkTo(opened!, caseId, mapi.supervisor);
    expect((await timeline(mapi.supervisor, caseId)).status).toBe(200);
    // Only the case's own region is told.
    expect(await mailTo(demoSupervisor.email)).toHaveLength(elsewhereBefore);

    let v = await version(caseId);
    const decided = await act(mapi.supervisor, caseId, {
      action: "decide",
      decision: "injury_confirmed",
      reason: "Seed-placed 10-34-0 over the safe rate; burn on every plant.",
      expectedVersion: v,
    });
    expect(decided.status).toBe(201);
    const [toRep] = await waitForMail(mf.users.repA.email, 1);
    expect(toRep!.subject).toMatch(/decided: injury confirmed/);
    expect(toRep!.text).toContain("Seed-placed 10-34-0 over the safe rate; burn on every plant.");
    await expectLinkTo(toRep!, caseId, mapi.repA);
    const repView = await timeline(mapi.repA, caseId);
    expect(repView.status).toBe(200);
    expect(repView.body.case).toMatchObject({ status: "decided", decision: "injury_confirmed" });

    v = (decided.body.case as CaseBody).version;
    const shared = await act(mapi.supervisor, caseId, { action: "share", shared: true, expectedVersion: v });
    expect(shared.status).toBe(201);
    const [toGrower] = await waitForMail(mf.users.grower.email, 1);
    expect(toGrower!.subject).toMatch(/shared with you/);
    await expectLinkTo(toGrower!, caseId, mapi.grower);
    const growerView = await timeline(mapi.grower, caseId);
    expect(growerView.status).toBe(200);
    expect(growerView.body.role).toBe("commenter");

    // The grower reads and comments, never decides.
    v = (shared.body.case as CaseBody).version;
    expect(
      (
        await act(mapi.grower, caseId, {
          action: "comment",
          body: "We'll move the starter to 2x2.",
          expectedVersion: v,
        })
      ).status,
    ).toBe(201);
    expect((await act(mapi.grower, caseId, { action: "close", expectedVersion: v })).status).toBe(403);

    // Unshared again, the case is out of the grower's sight, and nobody is e-mailed about that.
    const unshared = await act(mapi.supervisor, caseId, {
      action: "share",
      shared: false,
      expectedVersion: v,
    });
    expect(unshared.status).toBe(201);
    expect((await timeline(mapi.grower, caseId)).status).toBe(404);

    // Each person got exactly one e-mail about this case.
    for (const email of [mf.users.supervisor.email, mf.users.repA.email, mf.users.grower.email]) {
      expect(await mailTo(email), email).toHaveLength(1);
    }
  });
});
