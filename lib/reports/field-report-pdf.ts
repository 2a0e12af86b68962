import "server-only";
import { getTranslations } from "next-intl/server";
import { imageKindOf, renderPdf } from "@/lib/pdf/document";
import { type FieldReport, formatIndex, loadPhotoBytes, MAX_EMBEDDED_PHOTOS } from "./field-report";

// The field report as a PDF, from the same data and strings as the page.

const timeOf = (d: Date) => d.toISOString().slice(0, 16).replace("T", " ");

/** The safety notes every report carries, in the wording the field app uses. */
export async function reportCautions() {
  const tDig = await getTranslations({ locale: "en", namespace: "dig" });
  const tField = await getTranslations({ locale: "en", namespace: "field" });
  return {
    digging: [tDig("safety.utilities"), tDig("safety.irrigation"), tDig("safety.seed"), tDig("safety.heat")],
    fertilizer: tField("calculator.fertilizer.caution"),
    guidance: tField("calculator.guidance"),
  };
}

/** The sources of the report's computations: the agronomy core's, then the products' own. */
export async function reportSources(report: FieldReport): Promise<string[]> {
  const t = await getTranslations({ locale: "en", namespace: "reports" });
  const tField = await getTranslations({ locale: "en", namespace: "field" });
  return [
    t("sources.rootIndex"),
    t("sources.leafStage"),
    tField("calculator.gdd.dailySource"),
    tField("calculator.gdd.stageSource"),
    tField("calculator.fertilizer.seedSafeSource"),
    tField("calculator.fertilizer.auditSource"),
    tField("calculator.fertilizer.unitsSource"),
    ...report.productSources,
  ];
}

export async function renderFieldReportPdf(report: FieldReport, author?: string): Promise<Uint8Array> {
  const t = await getTranslations({ locale: "en", namespace: "reports" });
  const tField = await getTranslations({ locale: "en", namespace: "field" });
  const cautions = await reportCautions();
  const sources = await reportSources(report);
  const photoBytes = await loadPhotoBytes(report);
  const { field } = report;
  const generated = timeOf(report.generatedAt);

  return renderPdf(
    {
      title: t("documentTitle", { field: field.name }),
      subject: t("subject", { account: field.accountName, field: field.name }),
      author,
      generatedAt: report.generatedAt,
      footer: (page, count) => t("footer", { page, count, field: field.name, time: generated }),
    },
    (w) => {
      w.heading(t("documentTitle", { field: field.name }), 1);
      w.paragraph(t("generatedAt", { time: generated }), { muted: true });
      w.cautionBox(cautions.guidance, t("cautions.guidanceTitle"));

      w.heading(t("summary.heading"), 2);
      const latest = report.digs.at(-1);
      w.keyValues([
        [t("summary.field"), field.name],
        [t("summary.account"), field.accountName],
        [
          t("summary.area"),
          field.areaAcres === null
            ? t("summary.unknown")
            : t("summary.acres", { value: Math.round(field.areaAcres * 10) / 10 }),
        ],
        [t("summary.irrigation"), t(`irrigation.${field.irrigation}`)],
        [t("summary.soil"), t(`soil.${field.soilTexture}`)],
        [t("summary.firstIrrigation"), field.firstIrrigationOn ?? t("summary.unknown")],
        [t("summary.digs"), String(report.digs.length)],
        ...(latest
          ? [
              [
                t("summary.latestDig"),
                t("summary.latestDigValue", { date: latest.day, stage: latest.leafStage ?? "-" }),
              ] as const,
            ]
          : []),
      ]);
      w.heading(t("summary.plantings"), 3);
      w.table({
        columns: [
          { header: t("summary.hybrid"), width: 2 },
          { header: t("summary.plantedOn"), width: 1.3 },
          { header: t("summary.seedingRate"), width: 1.3, align: "right" },
          { header: t("summary.seedingDepth"), align: "right" },
          { header: t("summary.rowSpacing"), align: "right" },
          { header: t("summary.stageNow"), width: 2.4 },
        ],
        rows: report.plantings.map((p) => [
          p.hybrid,
          p.plantedOn,
          String(p.seedingRate),
          String(p.seedingDepthIn),
          String(p.rowSpacingIn),
          p.stageNow
            ? t(p.stageNow.complete ? "summary.stageValue" : "summary.stageIncomplete", {
                stage: p.stageNow.stage,
                gdd: p.stageNow.gddF,
                date: p.stageNow.throughDate,
              })
            : t("summary.noStage"),
        ]),
        empty: t("summary.noPlantings"),
      });

      w.heading(t("digs.heading"), 2);
      w.table({
        columns: [
          { header: t("digs.date"), width: 1.2 },
          { header: t("digs.rep"), width: 1.3 },
          { header: t("digs.hybrid"), width: 1.4 },
          { header: t("digs.leafStage"), width: 0.8 },
          { header: t("digs.plants"), width: 0.7, align: "right" },
          { header: t("digs.rootIndex"), width: 1, align: "right" },
          { header: t("digs.flags"), width: 3 },
        ],
        rows: report.digs.map((d) => [
          d.day,
          d.repName ?? "",
          d.hybrid ?? "",
          d.leafStage ?? "",
          String(d.plantCount),
          formatIndex(d.rootIndex),
          [
            ...d.flags.map((f) => `${t(`severity.${f.severity}`)}: ${f.message}`),
            ...(d.flaggedByRep ? [t("digs.flaggedByRep")] : []),
          ].join("\n") || t("digs.noFlags"),
        ]),
        empty: t("digs.empty"),
      });

      w.heading(t("byHybrid.heading"), 2);
      w.table({
        columns: [
          { header: t("byHybrid.hybrid"), width: 2 },
          { header: t("byHybrid.n"), align: "right" },
          { header: t("byHybrid.mean"), align: "right" },
          { header: t("byHybrid.range"), align: "right" },
        ],
        rows: report.rootIndexByHybrid.map((h) => [
          h.hybrid,
          String(h.n),
          formatIndex(h.mean),
          t("byHybrid.rangeValue", { min: formatIndex(h.min), max: formatIndex(h.max) }),
        ]),
        empty: t("byHybrid.empty"),
      });

      w.heading(t("placement.heading"), 2);
      w.paragraph(t("placement.intro"), { muted: true });
      w.table({
        columns: [
          { header: t("placement.applied"), width: 1.1 },
          { header: t("placement.product"), width: 1.5 },
          { header: t("placement.rate"), width: 1 },
          { header: t("placement.placement"), width: 1.1 },
          { header: t("placement.hybrid"), width: 1.2 },
          { header: t("placement.measured"), width: 1.5 },
          { header: t("placement.findings"), width: 3.2 },
        ],
        rows: report.placement.map((p) => [
          p.appliedOn,
          p.productName,
          t("placement.rateValue", { rate: p.rate, unit: p.rateUnit }),
          tField(`calculator.fertilizer.placements.${p.placement}`),
          p.hybrid,
          p.measured && p.measuredOn
            ? t("placement.measuredValue", {
                beside: p.measured.besideIn,
                below: p.measured.belowIn,
                date: p.measuredOn,
              })
            : t("placement.notMeasured"),
          p.error
            ? t("placement.notAudited", { reason: p.error })
            : p.findings.length === 0
              ? t("placement.noFindings")
              : p.findings.map((f) => `${t(`severity.${f.severity}`)}: ${f.message}`).join("\n"),
        ]),
        empty: t("placement.empty"),
      });

      w.heading(t("recommendations.heading"), 2);
      if (report.recommendations.length === 0) w.paragraph(t("recommendations.empty"), { muted: true });
      for (const r of report.recommendations) {
        w.paragraph(
          t("recommendations.byline", { date: r.day, rep: r.repName ?? t("recommendations.unknownRep") }),
          { bold: true },
        );
        w.paragraph(r.text);
      }

      w.heading(t("photos.heading"), 2);
      const pictures = report.photos.filter((p) => !p.isIllustration);
      const illustrations = report.photos.filter((p) => p.isIllustration);
      if (report.photos.length === 0) w.paragraph(t("photos.empty"), { muted: true });
      for (const photo of pictures.slice(0, MAX_EMBEDDED_PHOTOS)) {
        const caption = t("photos.caption", {
          date: photo.day,
          caption: photo.caption ?? t("photos.noCaption"),
        });
        const bytes = photoBytes.get(photo.id);
        const sha = photo.sha256.slice(0, 12);
        if (!bytes) {
          const embeddable = photo.contentType === "image/jpeg" || photo.contentType === "image/png";
          w.paragraph(
            embeddable
              ? t("photos.notLoaded", { sha })
              : t("photos.notEmbeddable", { sha, type: photo.contentType }),
            { muted: true },
          );
          continue;
        }
        w.image(bytes, {
          caption,
          maxWidth: 360,
          maxHeight: 260,
          unsupportedText: t("photos.notEmbeddable", {
            sha,
            type: imageKindOf(bytes) ?? photo.contentType,
          }),
        });
      }
      if (pictures.length > MAX_EMBEDDED_PHOTOS) {
        w.paragraph(t("photos.more", { count: pictures.length - MAX_EMBEDDED_PHOTOS }), { muted: true });
      }
      if (illustrations.length > 0) {
        w.heading(t("photos.illustrations"), 3);
        w.bulletList(
          illustrations.map((p) =>
            t("photos.illustration", { date: p.day, caption: p.caption ?? t("photos.noCaption") }),
          ),
        );
      }

      w.heading(t("cautions.heading"), 2);
      w.cautionBox(cautions.digging.join("\n"), t("cautions.digging"));
      w.cautionBox(cautions.fertilizer, t("cautions.fertilizer"));
      w.cautionBox(cautions.guidance, t("cautions.guidanceTitle"));

      w.sources(sources, t("sources.heading"));
    },
  );
}
