import { getFormatter, getTranslations } from "next-intl/server";
import { getCaseEvidence, productGradeLabel } from "@/db/queries/case-view";
import { authenticate, handle, notFoundJson } from "@/lib/http";
import { imageKindOf, renderPdf } from "@/lib/pdf/document";
import { isRecordId } from "@/lib/records/schemas";
import { getObjectBytes } from "@/lib/storage/s3";

type Ctx = { params: Promise<{ id: string }> };

const num = (x: number | null) => (x === null ? "-" : String(Math.round(x * 100) / 100));

// GET /api/cases/:id/evidence: the case's evidence file as a PDF for whoever may read the case (the
// same evidence as the case page; JPEG and PNG photos printed, every photo's SHA-256 listed).
export const GET = handle<Ctx>("GET /api/cases/[id]/evidence", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("case");
  const ev = await getCaseEvidence(auth.user, id);
  if (!ev) return notFoundJson("case");

  const t = await getTranslations({ locale: "en", namespace: "cases" });
  const format = await getFormatter({ locale: "en" });
  const when = (iso: string) =>
    `${format.dateTime(new Date(iso), { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" })} UTC`;
  // A photo the bucket cannot give back is named as missing in the file, and logged.
  const photoBytes = await Promise.all(
    ev.photos.map((p) =>
      getObjectBytes(p.objectKey).catch((error: unknown) => {
        console.warn(`Case ${ev.case.id}: photo ${p.sha256} could not be read from the bucket`, error);
        return null;
      }),
    ),
  );
  const { case: c, dig, field, account, planting, assessment } = ev;
  const title = t("pdf.title", { field: field.name, account: account.name });
  const generatedAt = new Date();

  const pdf = await renderPdf(
    { title, subject: `Injury case ${c.id}`, author: auth.user.name, generatedAt },
    (w) => {
      w.heading(title, 1);
      w.paragraph(t("pdf.generated", { when: when(generatedAt.toISOString()), name: auth.user.name }), {
        muted: true,
      });
      w.keyValues([
        [t("pdf.case"), c.id],
        [t("pdf.status"), t(`status.${c.status}`)],
        [t("pdf.severity"), t(`severity.${c.severity}`)],
        [t("pdf.decision"), c.decision ? t(`decision.${c.decision}`) : t("pdf.undecided")],
        ...(c.decisionReason ? ([[t("page.decisionReason"), c.decisionReason]] as [string, string][]) : []),
        [t("pdf.opened"), when(c.openedAt)],
        [t("pdf.assigned"), c.assignedTo?.name ?? t("page.unassigned")],
      ]);

      w.heading(t("page.dig.heading"), 2);
      w.keyValues([
        [t("page.dig.dugAt"), when(dig.dugAt)],
        [t("page.dig.dugBy"), dig.rep?.name ?? t("page.dig.unknown")],
        [
          t("page.dig.location"),
          dig.latitude !== null && dig.longitude !== null
            ? t("page.dig.coordinates", {
                latitude: dig.latitude.toFixed(5),
                longitude: dig.longitude.toFixed(5),
              })
            : t("page.dig.noLocation"),
        ],
        [t("page.dig.soilMoisture"), dig.soilMoisture ?? t("page.dig.unknown")],
        [
          t("page.dig.soilTemp"),
          dig.soilTempF === null
            ? t("page.dig.unknown")
            : t("page.dig.soilTempValue", { value: num(dig.soilTempF) }),
        ],
        [t("page.dig.irrigated"), dig.irrigatedYet ? t("page.dig.yes") : t("page.dig.no")],
        [t("pdf.field"), field.name],
      ]);

      w.heading(t("page.planting.heading"), 2);
      if (planting) {
        w.keyValues([
          [t("page.planting.hybrid"), planting.hybrid],
          [t("page.planting.plantedOn"), planting.plantedOn],
          [
            t("page.planting.seedingRate"),
            t("page.planting.seedingRateValue", { value: planting.seedingRate }),
          ],
          [
            t("page.planting.seedingDepth"),
            t("page.planting.inches", { value: num(planting.seedingDepthIn) }),
          ],
          [t("page.planting.rowSpacing"), t("page.planting.inches", { value: num(planting.rowSpacingIn) })],
          [t("page.planting.soil"), planting.soilTexture],
        ]);
      } else {
        w.paragraph(t("page.planting.none"), { muted: true });
      }
      w.heading(t("page.passes.heading"), 3);
      w.table({
        columns: [
          { header: t("page.passes.appliedOn") },
          { header: t("page.passes.product"), width: 2.5 },
          { header: t("page.passes.rate"), align: "right" },
          { header: t("page.passes.placement") },
          { header: t("page.passes.intended"), width: 1.4 },
        ],
        rows: ev.passes.map((p) => [
          p.appliedOn,
          productGradeLabel(p.product),
          `${num(p.rate)} ${p.rateUnit}`,
          t(`page.placement.${p.placement}`),
          p.intendedBesideIn !== null && p.intendedBelowIn !== null
            ? t("page.passes.intendedValue", {
                beside: num(p.intendedBesideIn),
                below: num(p.intendedBelowIn),
              })
            : "-",
        ]),
        empty: t("page.passes.none"),
      });
      w.cautionBox(t("page.passes.guidance"));

      w.heading(t("page.plants.heading"), 2);
      w.table({
        columns: [
          { header: "#", width: 0.4 },
          { header: t("page.plants.stage"), width: 0.6 },
          { header: t("page.plants.seedingDepth") },
          { header: t("page.plants.crownDepth") },
          { header: t("page.plants.mesocotyl") },
          { header: t("page.plants.seminalScore") },
          { header: t("page.plants.nodalWhorls") },
          { header: t("page.plants.nodalCount") },
          { header: t("page.plants.longestNodal") },
          { header: t("page.plants.seminalInjury") },
          { header: t("page.plants.nodalInjury") },
          { header: t("page.plants.band") },
          { header: t("page.plants.findings"), width: 1.4 },
          { header: t("page.plants.rootIndex") },
        ],
        rows: ev.plants.map((p, i) => [
          String(i + 1),
          p.leafStage,
          num(p.seedingDepthIn),
          num(p.crownDepthIn),
          p.mesocotyl ?? "-",
          num(p.seminalScore),
          num(p.nodalWhorls),
          num(p.nodalCount),
          num(p.longestNodalIn),
          p.seminalInjury,
          p.nodalInjury,
          p.bandBesideIn !== null && p.bandBelowIn !== null
            ? `${num(p.bandBesideIn)} x ${num(p.bandBelowIn)}`
            : "-",
          p.findings.join(", ").replaceAll("_", " ") || "-",
          num(p.rootIndex),
        ]),
        empty: t("page.plants.none"),
      });

      w.heading(t("page.assessment.heading"), 2);
      w.paragraph(t("page.assessment.intro"), { muted: true });
      if (!assessment) {
        w.paragraph(t("page.assessment.none"));
      } else {
        w.keyValues([
          [
            t("page.assessment.siteIndex"),
            t("page.assessment.siteIndexValue", { value: num(assessment.siteIndex) }),
          ],
          [t("page.assessment.stage"), assessment.leafCollars === 0 ? "VE" : `V${assessment.leafCollars}`],
          [t("page.assessment.plantIndexes"), assessment.plants.map((p) => num(p.index)).join(", ")],
        ]);
        if (assessment.flagForReview.flag) {
          w.paragraph(`${t("page.assessment.review")}: ${assessment.flagForReview.reason}`);
        }
        const findingLines = (list: typeof assessment.flags) =>
          list.map(
            (f) =>
              `${t(`severity.${f.severity}`)}: ${f.message} (${Object.entries(f.numbers)
                .map(([k, q]) => `${k} ${num(q.value)} ${q.unit}`)
                .join("; ")})`,
          );
        w.heading(t("page.assessment.audit"), 3);
        if (assessment.audit.length === 0) w.paragraph(t("page.assessment.auditNone"), { muted: true });
        else w.bulletList(findingLines(assessment.audit));
        w.heading(t("page.assessment.flags"), 3);
        if (assessment.flags.length === 0) w.paragraph(t("page.assessment.flagsNone"), { muted: true });
        else w.bulletList(findingLines(assessment.flags));
      }

      w.heading(t("page.recommendation.heading"), 2);
      w.paragraph(dig.recommendation ?? t("page.recommendation.none"));

      w.heading(t("page.conflicts.heading"), 2);
      w.table({
        columns: [
          { header: t("page.conflicts.record") },
          { header: t("page.conflicts.field") },
          { header: t("page.conflicts.server"), width: 1.5 },
          { header: t("page.conflicts.client"), width: 1.5 },
          { header: t("page.conflicts.settled"), width: 1.5 },
        ],
        rows: ev.conflicts.map((x) => [
          x.tableName,
          x.fieldName,
          `${JSON.stringify(x.serverValue)} (${x.serverUser ?? "-"})`,
          `${JSON.stringify(x.clientValue)} (${x.clientUser ?? "-"})`,
          x.settledAt
            ? `${JSON.stringify(x.settledValue)} (${x.settledBy ?? "-"})`
            : t("page.conflicts.open"),
        ]),
        empty: t("page.conflicts.none"),
      });

      w.heading(t("page.timeline.heading"), 2);
      w.table({
        columns: [
          { header: t("pdf.when"), width: 1.3 },
          { header: t("pdf.who") },
          { header: t("pdf.what") },
          { header: t("pdf.text"), width: 2.5 },
        ],
        rows: ev.events.map((e) => [
          when(e.createdAt),
          e.actor?.name ?? t("page.timeline.system"),
          t(`page.timeline.event.${e.kind}`),
          e.body ?? "",
        ]),
        empty: t("page.timeline.none"),
      });

      w.heading(t("pdf.photoHashes"), 2);
      if (ev.photos.length === 0) w.paragraph(t("page.photos.none"), { muted: true });
      ev.photos.forEach((p, i) => {
        w.paragraph(
          `${i + 1}. ${p.caption ?? ""} ${p.capturedAt ? t("page.photos.captured", { when: when(p.capturedAt) }) : t("page.photos.capturedUnknown")}`,
          { bold: true },
        );
        w.paragraph(`${t("page.photos.sha256")}: ${p.sha256}`);
      });
      ev.photos.forEach((p, i) => {
        const bytes = photoBytes[i];
        const caption = `${i + 1}. ${p.caption ?? ""} (${p.sha256.slice(0, 12)}…)`;
        if (!bytes) {
          w.paragraph(`${caption} ${t("pdf.photoMissing")}`, { muted: true });
        } else if (imageKindOf(bytes)) {
          w.image(bytes, {
            caption,
            maxHeight: 420,
            unsupportedText: `${caption} ${t("pdf.photoNotEmbedded")}`,
          });
        } else {
          w.paragraph(`${caption} ${t("pdf.photoNotEmbedded")}`, { muted: true });
        }
      });
    },
  );

  const name = `case-${c.id.slice(0, 8)}-evidence.pdf`;
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `attachment; filename="${name}"`,
      "cache-control": "private, no-store",
    },
  });
});
