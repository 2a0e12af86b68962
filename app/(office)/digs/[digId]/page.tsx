import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getFormatter, getTranslations } from "next-intl/server";
import { PointMap, type PolygonGeometry } from "@/app/(office)/_components/map";
import { findAccountAccess } from "@/db/queries/access";
import {
  findDigCase,
  findDigDetail,
  listDigPhotos,
  listDigPlants,
  listRecommendationResponses,
} from "@/db/queries/dig-detail";
import type { DigAssessment, Finding, Severity } from "@/lib/agronomy";
import { can } from "@/lib/auth/permissions";
import { requirePageUser } from "@/lib/auth/session";
import { env } from "@/lib/env";
import { stageOfCollars } from "@/lib/digs/assessment";
import { isRecordId } from "@/lib/records/schemas";
import { presignedGetUrl } from "@/lib/storage/s3";
import { PlainHeader, TableShell } from "../../_components/data-table";
import { RecommendationResponses } from "../../_components/recommendation-responses";

export const metadata: Metadata = { title: "Dig" };

const SEVERITY_STYLE: Record<Severity, string> = {
  info: "border-water-500 bg-water-50",
  caution: "border-caution-500 bg-caution-50",
  warning: "border-burn-500 bg-burn-50",
  critical: "border-burn-700 bg-burn-50",
};

// "plantsWithBurn" → "plants with burn": the agronomy core's number names, read plainly.
const words = (key: string) => key.replace(/([a-z0-9])([A-Z])/g, "$1 $2").toLowerCase();

// The stored assessment is the agronomy core's output as JSON; anything else is shown as missing.
function storedAssessment(value: unknown): DigAssessment | null {
  if (typeof value !== "object" || value === null) return null;
  const a = value as Partial<DigAssessment>;
  if (typeof a.siteIndex !== "number" || typeof a.leafCollars !== "number") return null;
  if (!Array.isArray(a.plants) || !Array.isArray(a.audit) || !Array.isArray(a.flags)) return null;
  return a as DigAssessment;
}

function polygonOf(boundary: unknown): PolygonGeometry | null {
  if (!boundary || typeof boundary !== "object") return null;
  const type = (boundary as { type?: unknown }).type;
  return type === "Polygon" || type === "MultiPolygon" ? (boundary as PolygonGeometry) : null;
}

export default async function DigPage({ params }: { params: Promise<{ digId: string }> }) {
  const user = await requirePageUser();
  const { digId } = await params;
  if (!isRecordId(digId)) notFound();
  const dig = await findDigDetail(digId);
  const access = dig && (await findAccountAccess(user, dig.accountId));
  if (!dig || !access || !can(user, "read", { kind: "digSite", access })) notFound();

  const [plants, photos, digCase, responses] = await Promise.all([
    listDigPlants(digId),
    listDigPhotos([digId]),
    findDigCase(digId),
    listRecommendationResponses([digId]),
  ]);
  const photoUrls = await Promise.all(photos.map((p) => presignedGetUrl(p.objectKey)));

  const t = await getTranslations("office.dig");
  const tc = await getTranslations("office.common");
  const tPlant = await getTranslations("dig.plant");
  const tSite = await getTranslations("dig.site");
  const tSummary = await getTranslations("dig.summary");
  const format = await getFormatter();
  const when = (d: Date) => format.dateTime(d, { dateStyle: "medium", timeStyle: "short" });
  const num = (v: number | null, digits = 2) =>
    v === null ? tc("none") : format.number(v, { maximumFractionDigits: digits });

  const a = storedAssessment(dig.assessment);
  const auditKeys = new Set((a?.audit ?? []).map((f) => `${f.code}|${f.message}`));
  const rootFlags = (a?.flags ?? []).filter((f) => !auditKeys.has(`${f.code}|${f.message}`));
  const isGrower = user.role === "grower";
  const resource = { kind: "recommendationResponse", access } as const;
  const canComment = can(user, "write", resource) && user.role !== "admin";
  const hasRecommendation = Boolean(dig.recommendation?.trim());
  const acknowledged = responses.some((r) => r.kind === "acknowledged" && r.userId === user.id);
  const showCase =
    digCase && can(user, "read", { kind: "case", access, sharedWithGrower: digCase.sharedWithGrower });

  return (
    <article aria-labelledby="dig-heading" className="space-y-6">
      <header className="space-y-1">
        <Link className="underline" href="/digs">
          {t("backToDigs")}
        </Link>
        <h1 id="dig-heading">{t("title", { field: dig.fieldName })}</h1>
        <p className="text-soil-700">
          {t("subtitle", { account: dig.accountName, date: t("timesUtc", { time: when(dig.dugAt) }) })}
        </p>
      </header>

      <div className="grid gap-4 md:grid-cols-2">
        <section className="card" aria-labelledby="dig-where">
          <h2 id="dig-where">{t("location")}</h2>
          <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
            <dt className="font-semibold">{t("field")}</dt>
            <dd>
              <Link className="underline" href={`/fields/${dig.fieldId}`}>
                {dig.fieldName}
              </Link>
            </dd>
            <dt className="font-semibold">{t("account")}</dt>
            <dd>
              <Link className="underline" href={`/accounts/${dig.accountId}`}>
                {dig.accountName}
              </Link>
            </dd>
            <dt className="font-semibold">{t("rep")}</dt>
            <dd>{dig.repName ?? tc("none")}</dd>
            <dt className="font-semibold">{t("dugAt")}</dt>
            <dd>
              <time dateTime={dig.dugAt.toISOString()}>{t("timesUtc", { time: when(dig.dugAt) })}</time>
            </dd>
          </dl>
          {dig.latitude !== null && dig.longitude !== null ? (
            <p className="mt-2">
              {t("coordinates", {
                lat: format.number(dig.latitude, { maximumFractionDigits: 6 }),
                lon: format.number(dig.longitude, { maximumFractionDigits: 6 }),
              })}
              {dig.accuracyM !== null ? ` (${t("accuracy", { m: num(dig.accuracyM, 1) })})` : null}
            </p>
          ) : null}
          {dig.latitude !== null && dig.longitude !== null ? (
            <div className="mt-3">
              <PointMap
                latitude={dig.latitude}
                longitude={dig.longitude}
                boundary={polygonOf(dig.fieldBoundary)}
                tileUrl={env.MAP_TILE_URL}
                tileAttribution={env.MAP_TILE_ATTRIBUTION}
              />
            </div>
          ) : (
            <p className="mt-2 text-soil-700">{t("noLocation")}</p>
          )}
        </section>

        <section className="card" aria-labelledby="dig-planting">
          <h2 id="dig-planting">{t("planting")}</h2>
          {dig.planting ? (
            <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
              <dt className="font-semibold">{t("hybrid")}</dt>
              <dd>{dig.planting.hybrid}</dd>
              <dt className="font-semibold">{t("plantedOn")}</dt>
              <dd>
                {format.dateTime(new Date(`${dig.planting.plantedOn}T00:00:00Z`), { dateStyle: "medium" })}
              </dd>
              <dt className="font-semibold">{t("seedingDepth")}</dt>
              <dd>{t("inches", { value: num(dig.planting.seedingDepthIn) })}</dd>
              <dt className="font-semibold">{t("rowSpacing")}</dt>
              <dd>{t("inches", { value: num(dig.planting.rowSpacingIn) })}</dd>
              <dt className="font-semibold">{t("seedingRate")}</dt>
              <dd>{t("seedsPerAcre", { value: format.number(dig.planting.seedingRate) })}</dd>
            </dl>
          ) : (
            <p className="mt-2 text-soil-700">{t("noPlanting")}</p>
          )}
          <h3 className="mt-4 text-lg font-bold">{t("conditions")}</h3>
          <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
            <dt className="font-semibold">{t("soilMoisture")}</dt>
            <dd>{dig.soilMoisture ? tSite(`moisture.${dig.soilMoisture}`) : t("notRecorded")}</dd>
            <dt className="font-semibold">{t("soilTemp")}</dt>
            <dd>
              {dig.soilTempF === null ? t("notRecorded") : t("degreesF", { value: num(dig.soilTempF, 1) })}
            </dd>
            <dt className="font-semibold">{t("irrigatedYet")}</dt>
            <dd>{dig.irrigatedYet ? t("yes") : t("no")}</dd>
          </dl>
          {dig.notes ? (
            <>
              <h3 className="mt-4 text-lg font-bold">{t("notes")}</h3>
              <p className="whitespace-pre-line">{dig.notes}</p>
            </>
          ) : null}
        </section>
      </div>

      <section aria-labelledby="dig-plants" className="space-y-2">
        <h2 id="dig-plants">{t("plants")}</h2>
        <TableShell
          caption={t("plantsCaption")}
          captionHidden
          isEmpty={plants.length === 0}
          empty={<p>{t("noPlants")}</p>}
        >
          <thead className="bg-soil-100">
            <tr>
              <PlainHeader label={t("col.n")} />
              <PlainHeader label={t("col.stage")} />
              <PlainHeader label={t("col.seedingDepth")} align="right" />
              <PlainHeader label={t("col.crownDepth")} align="right" />
              <PlainHeader label={t("col.mesocotyl")} />
              <PlainHeader label={t("col.seminalScore")} align="right" />
              <PlainHeader label={t("col.nodalWhorls")} align="right" />
              <PlainHeader label={t("col.nodalCount")} align="right" />
              <PlainHeader label={t("col.longestNodal")} align="right" />
              <PlainHeader label={t("col.seminalInjury")} />
              <PlainHeader label={t("col.nodalInjury")} />
              <PlainHeader label={t("col.band")} />
              <PlainHeader label={t("col.findings")} />
              <PlainHeader label={t("col.rootIndex")} align="right" />
            </tr>
          </thead>
          <tbody>
            {plants.map((p, i) => (
              <tr key={p.id} className="border-t border-soil-200 align-top">
                <th scope="row" className="p-3 font-semibold">
                  {tPlant("heading", { n: i + 1 })}
                </th>
                <td className="p-3">{p.leafStage}</td>
                <td className="p-3 text-right tabular-nums">{num(p.seedingDepthIn)}</td>
                <td className="p-3 text-right tabular-nums">{num(p.crownDepthIn)}</td>
                <td className="p-3">{p.mesocotyl ? tPlant(`mesocotylValue.${p.mesocotyl}`) : tc("none")}</td>
                <td className="p-3 text-right tabular-nums">{num(p.seminalScore, 1)}</td>
                <td className="p-3 text-right tabular-nums">{num(p.nodalWhorls, 0)}</td>
                <td className="p-3 text-right tabular-nums">{num(p.nodalCount, 0)}</td>
                <td className="p-3 text-right tabular-nums">{num(p.longestNodalIn)}</td>
                <td className="p-3">{tPlant(`injury.${p.seminalInjury}`)}</td>
                <td className="p-3">{tPlant(`injury.${p.nodalInjury}`)}</td>
                <td className="p-3 tabular-nums">
                  {p.bandBesideIn === null && p.bandBelowIn === null
                    ? tc("none")
                    : `${num(p.bandBesideIn)} / ${num(p.bandBelowIn)}`}
                </td>
                <td className="p-3">
                  {p.findings.length
                    ? p.findings
                        .map((f) =>
                          tPlant.has(`finding.${f}`) ? tPlant(`finding.${f}`) : f.replaceAll("_", " "),
                        )
                        .join("; ")
                    : tc("none")}
                  {p.notes ? <p className="mt-1 text-sm text-soil-700">{p.notes}</p> : null}
                </td>
                <td className="p-3 text-right font-semibold tabular-nums">{num(p.rootIndex, 1)}</td>
              </tr>
            ))}
          </tbody>
        </TableShell>
      </section>

      <section
        aria-labelledby="dig-assessment"
        className="rounded-card border-2 border-sprout-700 bg-sprout-50 p-4"
      >
        <h2 id="dig-assessment">{t("assessment")}</h2>
        <p className="mt-1 text-sm text-soil-700">{t("assessmentIntro")}</p>
        {a ? (
          <div className="mt-3 space-y-4">
            <div>
              <p className="text-lg">
                {t.rich("siteIndex", {
                  index: format.number(a.siteIndex, { maximumFractionDigits: 1 }),
                  stage: stageOfCollars(a.leafCollars),
                  strong: (chunks) => <strong className="text-3xl text-sprout-900">{chunks}</strong>,
                })}
              </p>
              <meter
                className="mt-1 h-4 w-full"
                min={0}
                max={100}
                low={40}
                high={60}
                optimum={100}
                value={a.siteIndex}
                aria-label={t("indexMeter")}
              />
              {a.plants.length ? (
                <p className="mt-1 text-sm">
                  {t("plantIndexes")}:{" "}
                  {a.plants
                    .map((p, i) =>
                      t("plantIndex", {
                        n: i + 1,
                        index: format.number(p.index, { maximumFractionDigits: 1 }),
                      }),
                    )
                    .join(" · ")}
                </p>
              ) : null}
            </div>
            <div>
              <h3 className="text-lg font-bold">{tSummary("placement")}</h3>
              {a.audit.length ? (
                <FindingList
                  findings={a.audit}
                  severityLabel={(s) => tSummary(`severity.${s}`)}
                  format={format}
                />
              ) : (
                <p>{tSummary("noAuditFindings")}</p>
              )}
            </div>
            <div>
              <h3 className="text-lg font-bold">{tSummary("flags")}</h3>
              {rootFlags.length ? (
                <FindingList
                  findings={rootFlags}
                  severityLabel={(s) => tSummary(`severity.${s}`)}
                  format={format}
                />
              ) : (
                <p>{tSummary("noFlags")}</p>
              )}
            </div>
            <div>
              <h3 className="text-lg font-bold">{t("review")}</h3>
              <p>
                {a.flagForReview.flag ? t("reviewYes", { reason: a.flagForReview.reason }) : t("reviewNo")}
              </p>
              {a.flagForReview.flag && a.flagForReview.reasons.length > 1 ? (
                <ul className="ml-6 list-disc">
                  {a.flagForReview.reasons.map((r) => (
                    <li key={r}>{r}</li>
                  ))}
                </ul>
              ) : null}
              {dig.flaggedByRep ? <p className="mt-1 font-semibold">{tc("flaggedByRep")}</p> : null}
            </div>
          </div>
        ) : (
          <p className="mt-3 font-semibold">{t("noAssessment")}</p>
        )}
      </section>

      <section aria-labelledby="dig-photos" className="space-y-2">
        <h2 id="dig-photos">{t("photos")}</h2>
        {photos.length === 0 ? (
          <p className="text-soil-700">{t("noPhotos")}</p>
        ) : (
          <>
            <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
              {photos.map((p, i) => (
                <li key={p.id} className="card p-2">
                  <figure>
                    {/* biome-ignore lint/performance/noImgElement: short-lived presigned links to the bucket, not optimisable */}
                    <img
                      src={photoUrls[i]?.url}
                      alt={
                        p.isIllustration ? t("illustrationAlt", { n: i + 1 }) : t("photoAlt", { n: i + 1 })
                      }
                      width={p.width ?? undefined}
                      height={p.height ?? undefined}
                      loading="lazy"
                      className="h-auto w-full rounded bg-soil-100"
                    />
                    <figcaption className="mt-2 space-y-1 text-sm">
                      {p.caption ? <p className="font-semibold">{p.caption}</p> : null}
                      {p.capturedAt ? (
                        <p>{t("captured", { time: t("timesUtc", { time: when(p.capturedAt) }) })}</p>
                      ) : null}
                      <p>
                        <abbr title="Secure Hash Algorithm 256">{t("sha256")}</abbr>:{" "}
                        <code className="break-all text-xs">{p.sha256}</code>
                      </p>
                    </figcaption>
                  </figure>
                </li>
              ))}
            </ul>
            <p className="text-sm text-soil-700">{t("linkExpires")}</p>
          </>
        )}
      </section>

      <section aria-labelledby="dig-recommendation" className="card">
        <h2 id="dig-recommendation">{t("recommendation")}</h2>
        {hasRecommendation ? (
          <blockquote className="mt-2 border-l-4 border-sprout-700 pl-4 whitespace-pre-line">
            {dig.recommendation}
          </blockquote>
        ) : (
          <p className="mt-2 text-soil-700">{t("noRecommendation")}</p>
        )}
        <RecommendationResponses
          digSiteId={dig.id}
          responses={responses.map((r) => ({
            id: r.id,
            userName: r.userName,
            userRole: r.userRole,
            kind: r.kind,
            body: r.body,
            createdAt: r.createdAt.toISOString(),
          }))}
          canAcknowledge={isGrower && hasRecommendation && canComment}
          acknowledged={acknowledged}
          canComment={canComment}
        />
      </section>

      <section aria-labelledby="dig-case" className="card">
        <h2 id="dig-case">{t("case")}</h2>
        {showCase ? (
          <div className="mt-2 space-y-1">
            <p>{t("caseStatus", { status: tc(`caseStatus.${digCase.status}`) })}</p>
            <p>{t("caseSeverity", { severity: t(`severity.${digCase.severity}`) })}</p>
            {!isGrower ? (
              <Link className="btn-secondary mt-2" href={`/cases/${digCase.id}`}>
                {t("caseOpen")}
              </Link>
            ) : null}
          </div>
        ) : (
          <p className="mt-2 text-soil-700">{t("noCase")}</p>
        )}
      </section>

      <section aria-labelledby="dig-cautions" className="notice-caution space-y-2">
        <h2 id="dig-cautions">{t("cautions")}</h2>
        <p>{t("guidance")}</p>
        <p>{t("digSafety")}</p>
      </section>
    </article>
  );
}

function FindingList({
  findings,
  severityLabel,
  format,
}: {
  findings: readonly Finding[];
  severityLabel: (s: Severity) => string;
  format: Awaited<ReturnType<typeof getFormatter>>;
}) {
  return (
    <ul className="mt-1 space-y-2">
      {findings.map((f, i) => (
        <li key={`${i}-${f.code}`} className={`rounded-lg border-l-8 p-3 ${SEVERITY_STYLE[f.severity]}`}>
          <p>
            <span className="mr-2 rounded bg-soil-900 px-2 py-0.5 text-sm font-bold text-white uppercase">
              {severityLabel(f.severity)}
            </span>
            {f.message}
          </p>
          {Object.keys(f.numbers).length > 0 ? (
            <dl className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-sm text-soil-700">
              {Object.entries(f.numbers).map(([key, q]) => (
                <div key={key}>
                  <dt className="inline">{words(key)}: </dt>
                  <dd className="inline font-semibold text-soil-900">
                    {format.number(q.value, { maximumFractionDigits: 2 })} {q.unit}
                  </dd>
                </div>
              ))}
            </dl>
          ) : null}
        </li>
      ))}
    </ul>
  );
}
