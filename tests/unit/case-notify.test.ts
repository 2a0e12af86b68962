// The case e-mails without services: who each notice goes to, the plain-text and HTML parts with the
// link back to the case (HTML-escaped), and a mail server that refuses one message neither throws
// nor stops the others (the change they report has already committed).
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { CaseNoticeContext } from "@/db/queries/case-actions";

const CASE_ID = "6bcd9c74-df80-4cbf-90b7-738495061728";

const context = (over: Partial<CaseNoticeContext> = {}): CaseNoticeContext => ({
  caseId: CASE_ID,
  status: "decided",
  severity: "critical",
  decision: "injury_confirmed",
  decisionReason: "Seed-placed 10-34-0 at 9 gal/ac on coarse soil <30 in rows>.",
  accountName: "Gravel & Sons",
  fieldName: "North 40",
  dugAt: new Date("2026-05-14T17:20:00Z"),
  repName: "Rita Rep",
  openedBody: "Burn on every plant of the dig.",
  supervisors: [
    { email: "sup-one@example.test", name: "Sam One" },
    { email: "sup-two@example.test", name: "Sue Two" },
  ],
  reps: [{ email: "rep@example.test", name: "Rita Rep" }],
  growers: [{ email: "grower@example.test", name: "Gil Grower" }],
  ...over,
});

const findContext = vi.fn<(id: string) => Promise<CaseNoticeContext | undefined>>();
const sendMail = vi.fn<(mail: { to: string }) => Promise<unknown>>();
vi.mock("@/db/queries/case-actions", () => ({ findCaseNoticeContext: (id: string) => findContext(id) }));
vi.mock("@/lib/mail/transport", () => ({ sendMail: (mail: { to: string }) => sendMail(mail) }));

const { caseNoticeMails, caseLink } = await import("@/lib/mail/case-templates");
const { notifyCase, notifyOpenedCases } = await import("@/lib/cases/notify");

describe("case e-mails", () => {
  it("a new case goes to each of the region's supervisors, with the reasons and the link", async () => {
    const mails = await caseNoticeMails("opened", context({ status: "new", decision: null }));
    expect(mails.map((m) => m.to)).toEqual(["sup-one@example.test", "sup-two@example.test"]);
    const [first] = mails;
    expect(first!.subject).toBe("New burn case (critical): Gravel & Sons, North 40");
    expect(first!.text).toContain("Hello Sam One,");
    expect(first!.text).toContain("dug on May 14, 2026 by Rita Rep");
    expect(first!.text).toContain("Why it was flagged: Burn on every plant of the dig.");
    expect(caseLink(CASE_ID)).toMatch(new RegExp(`^https?://[^/]+/cases/${CASE_ID}$`));
    expect(first!.text).toContain(caseLink(CASE_ID));
  });

  it("a decision goes to the rep with the decision and its reason; the HTML escapes what people wrote", async () => {
    const [mail, ...more] = await caseNoticeMails("decided", context());
    expect(more).toEqual([]);
    expect(mail!.to).toBe("rep@example.test");
    expect(mail!.subject).toBe("Burn case decided: injury confirmed — Gravel & Sons, North 40");
    expect(mail!.text).toContain("Reason: Seed-placed 10-34-0 at 9 gal/ac on coarse soil <30 in rows>.");
    expect(mail!.html).toContain("Gravel &#38; Sons");
    expect(mail!.html).toContain("&#60;30 in rows&#62;");
    expect(mail!.html).not.toContain("<30 in rows>");
    expect(mail!.html).toContain(`href="${caseLink(CASE_ID)}"`);
  });

  it("a shared case goes to the account's growers", async () => {
    const mails = await caseNoticeMails("shared", context());
    expect(mails.map((m) => m.to)).toEqual(["grower@example.test"]);
    expect(mails[0]!.subject).toBe("A burn case on Gravel & Sons was shared with you");
    expect(mails[0]!.text).toContain("Status now: decided");
  });

  it("nobody to tell means no e-mail", async () => {
    expect(await caseNoticeMails("shared", context({ growers: [] }))).toEqual([]);
  });
});

describe("sending after the commit", () => {
  let logged: ReturnType<typeof vi.spyOn>;
  beforeEach(() => {
    findContext.mockReset();
    sendMail.mockReset();
    logged = vi.spyOn(console, "error").mockImplementation(() => undefined);
  });
  afterEach(() => {
    logged.mockRestore();
  });

  it("a refused message is logged, the next recipient still gets theirs, and nothing throws", async () => {
    findContext.mockResolvedValue(context({ status: "new", decision: null }));
    sendMail.mockRejectedValueOnce(new Error("connection refused")).mockResolvedValue({});
    await expect(notifyOpenedCases([CASE_ID])).resolves.toBeUndefined();
    expect(sendMail.mock.calls.map(([m]) => m.to)).toEqual(["sup-one@example.test", "sup-two@example.test"]);
    expect(logged).toHaveBeenCalledTimes(1);
  });

  it("a failure to read the case is logged, not thrown", async () => {
    findContext.mockRejectedValue(new Error("database gone"));
    await expect(notifyCase("decided", CASE_ID)).resolves.toBeUndefined();
    expect(sendMail).not.toHaveBeenCalled();
    expect(logged).toHaveBeenCalledTimes(1);
  });
});
