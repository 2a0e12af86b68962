import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getTranslations } from "next-intl/server";
import type { ReactNode } from "react";
import { TableShell } from "@/app/(office)/_components/data-table";
import { can } from "@/lib/auth/permissions";
import { requirePageUser } from "@/lib/auth/session";
import { isRecordId } from "@/lib/records/schemas";
import { formatIndex, gatherFieldReport } from "@/lib/reports/field-report";
import { reportCautions, reportSources } from "@/lib/reports/field-report-pdf";
import { presignedGetUrl } from "@/lib/storage/s3";
import { PrintButton, SendReportButton } from "./_components/report-actions";

export const metadata: Metadata = { title: "Field report" };
export const dynamic = "force-dynamic";

const th = "px-3 py-2 font-semibold";
const td = "px-3 py-2 align-top";

function Section({ id, title, children }: { id: string; title: string; children: ReactNode }) {
  return (
    <section aria-labelledby={id} className="space-y-3 break-inside-avoid-page">
      <h2 id={id}>{title}</h2>
      {children}
    </section>
  );
}

export default async function FieldReportPage({ params }: { params: Promise<{ fieldId: string }> }) {
  const user = await requirePageUser();
  const { fieldId } = await params;
  if (!isRecordId(fieldId)) notFound();
  const report = await gatherFieldReport(user, fieldId);
  if (!report) notFound();
  const t = await getTranslations("reports");
  const tField = await getTranslations("field");
  const cautions = await reportCautions();
  const sources = await reportSources(report);
  const { field } = report;
  const mayWrite = can(user, "write", { kind: "field", access: report.access });
  const generated = report.generatedAt.toISOString().slice(0, 16).replace("T", " ");
  const latest = report.digs.at(-1);

  const pictures = report.photos.filter((p) => !p.isIllustration);
  const illustrations = report.photos.filter((p) => p.isIllustration);
  const pictureLinks = await Promise.all(
    pictures.map(async (p) =>
      p.contentType === "image/jpeg" || p.contentType === "image/png" || p.contentType === "image/webp"
        ? { photo: p, url: (await presignedGetUrl(p.objectKey)).url }
        : { photo: p, url: null },
    ),
  );

  return (
    <article aria-labelledby="report-heading" className="space-y-8">
      <header className="space-y-3">
        <p className="print:hidden">
          <Link href={`/fields/${field.id}`} className="font-semibold underline">
            {t("backToField")}
          </Link>
        </p>
        <h1 id="report-heading">{t("documentTitle", { field: field.name })}</h1>
        <p className="text-soil-700">{t("generatedAt", { time: generated })}</p>
        <div className="flex flex-wrap gap-3 print:hidden">
          <a className="btn-secondary" href={`/api/fields/${field.id}/report`} download>
            {t("downloadPdf")}
          </a>
          <PrintButton />
          <a className="btn-secondary" href={`/api/exports/digs?fieldId=${field.id}&kind=digs`} download>
            {t("csv.digs")}
          </a>
          <a className="btn-secondary" href={`/api/exports/digs?fieldId=${field.id}&kind=plants`} download>
            {t("csv.plants")}
          </a>
        </div>
        {mayWrite ? <SendReportButton fieldId={field.id} /> : null}
        <div className="notice-caution" role="note">
          <p className="font-semibold">{t("cautions.guidanceTitle")}</p>
          <p>{cautions.guidance}</p>
        </div>
      </header>

      <Section id="report-summary" title={t("summary.heading")}>
        <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-[max-content_1fr]">
          {(
            [
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
                    ],
                  ]
                : []),
            ] as [string, string][]
          ).map(([label, value]) => (
            <div key={label} className="contents">
              <dt className="font-semibold">{label}</dt>
              <dd>{value}</dd>
            </div>
          ))}
        </dl>
        <TableShell
          caption={t("summary.plantings")}
          isEmpty={report.plantings.length === 0}
          empty={t("summary.noPlantings")}
        >
          <thead className="bg-soil-50">
            <tr>
              <th scope="col" className={th}>
                {t("summary.hybrid")}
              </th>
              <th scope="col" className={th}>
                {t("summary.plantedOn")}
              </th>
              <th scope="col" className={`${th} text-right`}>
                {t("summary.seedingRate")}
              </th>
              <th scope="col" className={`${th} text-right`}>
                {t("summary.seedingDepth")}
              </th>
              <th scope="col" className={`${th} text-right`}>
                {t("summary.rowSpacing")}
              </th>
              <th scope="col" className={th}>
                {t("summary.stageNow")}
              </th>
            </tr>
          </thead>
          <tbody>
            {report.plantings.map((p) => (
              <tr key={p.id} className="border-t border-soil-200">
                <th scope="row" className={`${td} font-semibold`}>
                  {p.hybrid}
                </th>
                <td className={td}>{p.plantedOn}</td>
                <td className={`${td} text-right`}>{p.seedingRate}</td>
                <td className={`${td} text-right`}>{p.seedingDepthIn}</td>
                <td className={`${td} text-right`}>{p.rowSpacingIn}</td>
                <td className={td}>
                  {p.stageNow
                    ? t(p.stageNow.complete ? "summary.stageValue" : "summary.stageIncomplete", {
                        stage: p.stageNow.stage,
                        gdd: p.stageNow.gddF,
                        date: p.stageNow.throughDate,
                      })
                    : t("summary.noStage")}
                </td>
              </tr>
            ))}
          </tbody>
        </TableShell>
      </Section>

      <Section id="report-digs" title={t("digs.heading")}>
        <TableShell
          caption={t("digs.caption")}
          captionHidden
          isEmpty={report.digs.length === 0}
          empty={t("digs.empty")}
        >
          <thead className="bg-soil-50">
            <tr>
              <th scope="col" className={th}>
                {t("digs.date")}
              </th>
              <th scope="col" className={th}>
                {t("digs.rep")}
              </th>
              <th scope="col" className={th}>
                {t("digs.hybrid")}
              </th>
              <th scope="col" className={th}>
                {t("digs.leafStage")}
              </th>
              <th scope="col" className={`${th} text-right`}>
                {t("digs.plants")}
              </th>
              <th scope="col" className={`${th} text-right`}>
                {t("digs.rootIndex")}
              </th>
              <th scope="col" className={th}>
                {t("digs.flags")}
              </th>
            </tr>
          </thead>
          <tbody>
            {report.digs.map((d) => (
              <tr key={d.id} className="border-t border-soil-200">
                <th scope="row" className={`${td} font-semibold whitespace-nowrap`}>
                  {d.day}
                </th>
                <td className={td}>{d.repName ?? ""}</td>
                <td className={td}>{d.hybrid ?? ""}</td>
                <td className={td}>{d.leafStage ?? ""}</td>
                <td className={`${td} text-right`}>{d.plantCount}</td>
                <td className={`${td} text-right`}>{formatIndex(d.rootIndex)}</td>
                <td className={td}>
                  {d.flags.length === 0 && !d.flaggedByRep ? (
                    t("digs.noFlags")
                  ) : (
                    <ul className="space-y-1">
                      {d.flags.map((f) => (
                        <li key={`${f.severity}-${f.message}`}>
                          <span className="font-semibold">{t(`severity.${f.severity}`)}:</span> {f.message}
                        </li>
                      ))}
                      {d.flaggedByRep ? <li>{t("digs.flaggedByRep")}</li> : null}
                    </ul>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </TableShell>
      </Section>

      <Section id="report-by-hybrid" title={t("byHybrid.heading")}>
        <TableShell
          caption={t("byHybrid.caption")}
          captionHidden
          isEmpty={report.rootIndexByHybrid.length === 0}
          empty={t("byHybrid.empty")}
        >
          <thead className="bg-soil-50">
            <tr>
              <th scope="col" className={th}>
                {t("byHybrid.hybrid")}
              </th>
              <th scope="col" className={`${th} text-right`}>
                {t("byHybrid.n")}
              </th>
              <th scope="col" className={`${th} text-right`}>
                {t("byHybrid.mean")}
              </th>
              <th scope="col" className={`${th} text-right`}>
                {t("byHybrid.range")}
              </th>
            </tr>
          </thead>
          <tbody>
            {report.rootIndexByHybrid.map((h) => (
              <tr key={h.hybrid} className="border-t border-soil-200">
                <th scope="row" className={`${td} font-semibold`}>
                  {h.hybrid}
                </th>
                <td className={`${td} text-right`}>{h.n}</td>
                <td className={`${td} text-right`}>{formatIndex(h.mean)}</td>
                <td className={`${td} text-right`}>
                  {t("byHybrid.rangeValue", { min: formatIndex(h.min), max: formatIndex(h.max) })}
                </td>
              </tr>
            ))}
          </tbody>
        </TableShell>
      </Section>

      <Section id="report-placement" title={t("placement.heading")}>
        <p className="text-soil-700">{t("placement.intro")}</p>
        <TableShell
          caption={t("placement.caption")}
          captionHidden
          isEmpty={report.placement.length === 0}
          empty={t("placement.empty")}
        >
          <thead className="bg-soil-50">
            <tr>
              <th scope="col" className={th}>
                {t("placement.applied")}
              </th>
              <th scope="col" className={th}>
                {t("placement.product")}
              </th>
              <th scope="col" className={th}>
                {t("placement.rate")}
              </th>
              <th scope="col" className={th}>
                {t("placement.placement")}
              </th>
              <th scope="col" className={th}>
                {t("placement.hybrid")}
              </th>
              <th scope="col" className={th}>
                {t("placement.measured")}
              </th>
              <th scope="col" className={th}>
                {t("placement.findings")}
              </th>
            </tr>
          </thead>
          <tbody>
            {report.placement.map((p) => (
              <tr key={`${p.passId}-${p.hybrid}`} className="border-t border-soil-200">
                <th scope="row" className={`${td} font-semibold whitespace-nowrap`}>
                  {p.appliedOn}
                </th>
                <td className={td}>{p.productName}</td>
                <td className={td}>{t("placement.rateValue", { rate: p.rate, unit: p.rateUnit })}</td>
                <td className={td}>{tField(`calculator.fertilizer.placements.${p.placement}`)}</td>
                <td className={td}>{p.hybrid}</td>
                <td className={td}>
                  {p.measured && p.measuredOn
                    ? t("placement.measuredValue", {
                        beside: p.measured.besideIn,
                        below: p.measured.belowIn,
                        date: p.measuredOn,
                      })
                    : t("placement.notMeasured")}
                </td>
                <td className={td}>
                  {p.error ? (
                    t("placement.notAudited", { reason: p.error })
                  ) : p.findings.length === 0 ? (
                    t("placement.noFindings")
                  ) : (
                    <ul className="space-y-1">
                      {p.findings.map((f) => (
                        <li key={`${f.code}-${f.message}`}>
                          <span className="font-semibold">{t(`severity.${f.severity}`)}:</span> {f.message}
                        </li>
                      ))}
                    </ul>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </TableShell>
        <div className="notice-caution" role="note">
          <p className="font-semibold">{t("cautions.fertilizer")}</p>
          <p>{cautions.fertilizer}</p>
        </div>
      </Section>

      <Section id="report-recommendations" title={t("recommendations.heading")}>
        {report.recommendations.length === 0 ? (
          <p className="text-soil-700">{t("recommendations.empty")}</p>
        ) : (
          <ul className="space-y-3">
            {report.recommendations.map((r) => (
              <li key={r.digId} className="card">
                <p className="font-semibold">
                  {t("recommendations.byline", {
                    date: r.day,
                    rep: r.repName ?? t("recommendations.unknownRep"),
                  })}
                </p>
                <p className="whitespace-pre-line">{r.text}</p>
              </li>
            ))}
          </ul>
        )}
      </Section>

      <Section id="report-photos" title={t("photos.heading")}>
        {report.photos.length === 0 ? <p className="text-soil-700">{t("photos.empty")}</p> : null}
        {pictureLinks.length > 0 ? (
          <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
            {pictureLinks.map(({ photo, url }) => {
              const caption = t("photos.caption", {
                date: photo.day,
                caption: photo.caption ?? t("photos.noCaption"),
              });
              return (
                <li key={photo.id}>
                  <figure className="space-y-1">
                    {url ? (
                      // biome-ignore lint/performance/noImgElement: short-lived presigned links, not optimisable assets
                      <img src={url} alt={caption} className="w-full rounded-card border border-soil-200" />
                    ) : (
                      <p className="text-soil-700">
                        {t("photos.notEmbeddable", {
                          sha: photo.sha256.slice(0, 12),
                          type: photo.contentType,
                        })}
                      </p>
                    )}
                    <figcaption className="text-sm text-soil-700">{caption}</figcaption>
                  </figure>
                </li>
              );
            })}
          </ul>
        ) : null}
        {illustrations.length > 0 ? (
          <>
            <h3>{t("photos.illustrations")}</h3>
            <ul className="list-disc space-y-1 pl-6">
              {illustrations.map((p) => (
                <li key={p.id}>
                  {t("photos.illustration", { date: p.day, caption: p.caption ?? t("photos.noCaption") })}
                </li>
              ))}
            </ul>
          </>
        ) : null}
      </Section>

      <Section id="report-cautions" title={t("cautions.heading")}>
        <div className="notice-caution" role="note">
          <p className="font-semibold">{t("cautions.digging")}</p>
          <ul className="list-disc space-y-1 pl-6">
            {cautions.digging.map((line) => (
              <li key={line}>{line}</li>
            ))}
          </ul>
        </div>
        <div className="notice-caution" role="note">
          <p className="font-semibold">{t("cautions.guidanceTitle")}</p>
          <p>{cautions.guidance}</p>
        </div>
      </Section>

      <Section id="report-sources" title={t("sources.heading")}>
        <ol className="list-decimal space-y-1 pl-6 text-sm text-soil-700">
          {sources.map((s) => (
            <li key={s}>{s}</li>
          ))}
        </ol>
      </Section>
    </article>
  );
}
