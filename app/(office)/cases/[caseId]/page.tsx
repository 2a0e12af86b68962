import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getFormatter, getTranslations } from "next-intl/server";
import { PointMap, type PolygonGeometry } from "@/app/(office)/_components/map";
import { type CaseEvidence, getCaseEvidence, productGradeLabel } from "@/db/queries/case-view";
import type { Finding } from "@/lib/agronomy";
import { requirePageUser } from "@/lib/auth/session";
import { env } from "@/lib/env";
import { presignedGetUrl } from "@/lib/storage/s3";
import { SeverityBadge, StatusBadge } from "../_components/badges";
import { CaseActions } from "./case-actions";

export const metadata: Metadata = { title: "Injury case" };

type Translate = Awaited<ReturnType<typeof getTranslations<"cases">>>;
type Format = Awaited<ReturnType<typeof getFormatter>>;

const num = (x: number) => String(Math.round(x * 100) / 100);
const when = (format: Format, iso: string) =>
  `${format.dateTime(new Date(iso), { dateStyle: "medium", timeStyle: "short" })} UTC`;

function polygonOf(boundary: unknown): PolygonGeometry | null {
  if (!boundary || typeof boundary !== "object") return null;
  const type = (boundary as { type?: unknown }).type;
  return type === "Polygon" || type === "MultiPolygon" ? (boundary as PolygonGeometry) : null;
}

export default async function CasePage({ params }: { params: Promise<{ caseId: string }> }) {
  const user = await requirePageUser();
  const { caseId } = await params;
  const evidence = await getCaseEvidence(user, caseId);
  if (!evidence) notFound();
  const t = await getTranslations("cases");
  const format = await getFormatter();
  const { case: c, dig, field, account } = evidence;
  const photoUrls = await Promise.all(evidence.photos.map((p) => presignedGetUrl(p.objectKey)));

  return (
    <article aria-labelledby="case-heading" className="space-y-6">
      {user.role === "grower" ? null : (
        <p>
          <Link href="/cases" className="font-semibold text-water-700 underline">
            {t("page.back")}
          </Link>
        </p>
      )}
      <header className="space-y-3">
        <h1 id="case-heading">{t("page.title", { field: field.name, account: account.name })}</h1>
        <div className="flex flex-wrap items-center gap-2">
          <SeverityBadge severity={c.severity} />
          <StatusBadge status={c.status} />
          {c.decision ? <span className="font-semibold">{t(`decision.${c.decision}`)}</span> : null}
        </div>
        <ul className="flex flex-wrap gap-x-6 gap-y-1 text-soil-700">
          <li>{t("page.openedAt", { when: when(format, c.openedAt) })}</li>
          <li>{c.assignedTo ? t("page.assignedTo", { name: c.assignedTo.name }) : t("page.unassigned")}</li>
          <li>{c.sharedWithGrower ? t("page.shared") : t("page.notShared")}</li>
        </ul>
        {c.decision && c.decisionReason ? (
          <div className="notice-ok">
            <p className="font-semibold">
              {t(`decision.${c.decision}`)}
              {c.decidedAt ? ` · ${t("page.decidedAt", { when: when(format, c.decidedAt) })}` : ""}
            </p>
            <p className="mt-1">
              <span className="sr-only">{t("page.decisionReason")}: </span>
              {c.decisionReason}
            </p>
          </div>
        ) : null}
        {user.role === "grower" ? <p className="notice-caution">{t("page.growerNote")}</p> : null}
        {user.role === "rep" ? <p className="text-soil-700">{t("page.readOnly")}</p> : null}
        <div className="flex flex-wrap gap-3">
          <a className="btn-secondary" href={`/api/cases/${c.id}/evidence`} download>
            {t("page.downloadPdf")}
          </a>
          {user.role === "grower" ? null : (
            <Link className="btn-secondary" href={`/digs/${dig.id}`}>
              {t("page.openDig")}
            </Link>
          )}
        </div>
      </header>

      <DigSection evidence={evidence} t={t} format={format} />
      <PlantingSection evidence={evidence} t={t} format={format} />
      <PlantsSection evidence={evidence} t={t} />

      <section aria-labelledby="photos-heading" className="space-y-4">
        <h2 id="photos-heading">{t("page.photos.heading")}</h2>
        {evidence.photos.length === 0 ? (
          <p className="text-soil-700">{t("page.photos.none")}</p>
        ) : (
          <>
            <p className="text-sm text-soil-700">{t("page.photos.linkNote")}</p>
            {evidence.photos.map((p, i) => {
              const url = photoUrls[i]!.url;
              const plantNo = evidence.plants.findIndex((pl) => pl.id === p.dugPlantId);
              const alt = p.caption
                ? t("page.photos.altCaption", { caption: p.caption, n: i + 1, count: evidence.photos.length })
                : t("page.photos.alt", { n: i + 1, count: evidence.photos.length });
              return (
                <figure key={p.id} className="card space-y-2">
                  <a href={url} target="_blank" rel="noreferrer">
                    {/* biome-ignore lint/performance/noImgElement: full-size evidence through a short-lived presigned link, never resized */}
                    <img
                      src={url}
                      alt={alt}
                      width={p.width ?? undefined}
                      height={p.height ?? undefined}
                      className="h-auto max-w-full rounded"
                      data-sha256={p.sha256}
                    />
                  </a>
                  <figcaption className="space-y-1 text-sm">
                    {p.caption ? <p className="font-semibold">{p.caption}</p> : null}
                    {p.isIllustration ? (
                      <p className="notice-caution">{t("page.photos.illustration")}</p>
                    ) : null}
                    <p>
                      {p.capturedAt
                        ? t("page.photos.captured", { when: when(format, p.capturedAt) })
                        : t("page.photos.capturedUnknown")}
                      {plantNo >= 0 ? ` · ${t("page.photos.plant", { n: plantNo + 1 })}` : ""}
                      {` · ${t("page.photos.size", { kb: Math.round(p.byteSize / 1024), type: p.contentType })}`}
                    </p>
                    <p>
                      {t("page.photos.sha256")}: <code className="break-all">{p.sha256}</code>
                    </p>
                  </figcaption>
                </figure>
              );
            })}
          </>
        )}
      </section>

      <AssessmentSection evidence={evidence} t={t} />

      <section aria-labelledby="recommendation-heading" className="card space-y-2">
        <h2 id="recommendation-heading">{t("page.recommendation.heading")}</h2>
        {dig.recommendation ? (
          <p className="whitespace-pre-line">{dig.recommendation}</p>
        ) : (
          <p className="text-soil-700">{t("page.recommendation.none")}</p>
        )}
      </section>

      <ConflictsSection evidence={evidence} t={t} format={format} />
      <TimelineSection evidence={evidence} t={t} format={format} />

      {evidence.allowed.decide || evidence.allowed.comment ? (
        <CaseActions
          caseId={c.id}
          version={c.version}
          status={c.status}
          sharedWithGrower={c.sharedWithGrower}
          assignedTo={c.assignedTo?.id ?? null}
          canDecide={evidence.allowed.decide}
          canComment={evidence.allowed.comment}
          supervisors={evidence.supervisors}
        />
      ) : null}
    </article>
  );
}

interface SectionProps {
  evidence: CaseEvidence;
  t: Translate;
  format: Format;
}

function Pairs({ pairs }: { pairs: [string, React.ReactNode][] }) {
  return (
    <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-[max-content_1fr]">
      {pairs.map(([label, value]) => (
        <div key={label} className="contents">
          <dt className="font-semibold">{label}</dt>
          <dd>{value}</dd>
        </div>
      ))}
    </dl>
  );
}

function DigSection({ evidence, t, format }: SectionProps) {
  const { dig, field } = evidence;
  const unknown = t("page.dig.unknown");
  const hasPoint = dig.latitude !== null && dig.longitude !== null;
  return (
    <section aria-labelledby="dig-heading" className="card space-y-4">
      <h2 id="dig-heading">{t("page.dig.heading")}</h2>
      <div className="grid gap-4 md:grid-cols-2">
        <Pairs
          pairs={[
            [t("page.dig.dugAt"), when(format, dig.dugAt)],
            [t("page.dig.dugBy"), dig.rep?.name ?? unknown],
            [
              t("page.dig.location"),
              hasPoint
                ? t("page.dig.coordinates", {
                    latitude: dig.latitude!.toFixed(5),
                    longitude: dig.longitude!.toFixed(5),
                  })
                : t("page.dig.noLocation"),
            ],
            [
              t("page.dig.accuracy"),
              dig.accuracyM === null ? unknown : t("page.dig.accuracyValue", { meters: num(dig.accuracyM) }),
            ],
            [t("page.dig.soilMoisture"), dig.soilMoisture ?? unknown],
            [
              t("page.dig.soilTemp"),
              dig.soilTempF === null ? unknown : t("page.dig.soilTempValue", { value: num(dig.soilTempF) }),
            ],
            [t("page.dig.irrigated"), dig.irrigatedYet ? t("page.dig.yes") : t("page.dig.no")],
            ...(dig.notes ? ([[t("page.dig.notes"), dig.notes]] as [string, string][]) : []),
          ]}
        />
        {hasPoint ? (
          <PointMap
            latitude={dig.latitude!}
            longitude={dig.longitude!}
            boundary={polygonOf(field.boundary)}
            tileUrl={env.MAP_TILE_URL}
            tileAttribution={env.MAP_TILE_ATTRIBUTION}
          />
        ) : null}
      </div>
      {dig.flaggedByRep ? <p className="font-semibold">{t("page.dig.flaggedByRep")}</p> : null}
    </section>
  );
}

function PlantingSection({ evidence, t, format }: SectionProps) {
  const { planting, passes } = evidence;
  const inches = (v: number) => t("page.planting.inches", { value: num(v) });
  return (
    <section aria-labelledby="planting-heading" className="card space-y-4">
      <h2 id="planting-heading">{t("page.planting.heading")}</h2>
      {planting ? (
        <Pairs
          pairs={[
            [t("page.planting.hybrid"), planting.hybrid],
            [
              t("page.planting.plantedOn"),
              format.dateTime(new Date(`${planting.plantedOn}T12:00:00Z`), { dateStyle: "medium" }),
            ],
            [
              t("page.planting.seedingRate"),
              t("page.planting.seedingRateValue", { value: format.number(planting.seedingRate) }),
            ],
            [t("page.planting.seedingDepth"), inches(planting.seedingDepthIn)],
            [t("page.planting.rowSpacing"), inches(planting.rowSpacingIn)],
            [t("page.planting.soil"), planting.soilTexture],
          ]}
        />
      ) : (
        <p className="text-soil-700">{t("page.planting.none")}</p>
      )}
      <h3 className="text-lg font-semibold">{t("page.passes.heading")}</h3>
      <p className="notice-caution text-sm">{t("page.passes.guidance")}</p>
      {passes.length === 0 ? (
        <p className="text-soil-700">{t("page.passes.none")}</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full min-w-[36rem] text-left text-sm">
            <caption className="sr-only">{t("page.passes.caption")}</caption>
            <thead className="bg-soil-100">
              <tr>
                <th scope="col" className="px-3 py-2">
                  {t("page.passes.appliedOn")}
                </th>
                <th scope="col" className="px-3 py-2">
                  {t("page.passes.product")}
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  {t("page.passes.rate")}
                </th>
                <th scope="col" className="px-3 py-2">
                  {t("page.passes.placement")}
                </th>
                <th scope="col" className="px-3 py-2">
                  {t("page.passes.intended")}
                </th>
              </tr>
            </thead>
            <tbody>
              {passes.map((p) => (
                <tr key={p.id} className="border-t border-soil-200">
                  <td className="px-3 py-2">{p.appliedOn}</td>
                  <td className="px-3 py-2">
                    {productGradeLabel(p.product)}
                    {planting && p.plantingId && p.plantingId !== planting.id
                      ? ` ${t("page.passes.otherPlanting")}`
                      : ""}
                  </td>
                  <td className="px-3 py-2 text-right">
                    {num(p.rate)} {p.rateUnit}
                  </td>
                  <td className="px-3 py-2">{t(`page.placement.${p.placement}`)}</td>
                  <td className="px-3 py-2">
                    {p.intendedBesideIn !== null && p.intendedBelowIn !== null
                      ? t("page.passes.intendedValue", {
                          beside: num(p.intendedBesideIn),
                          below: num(p.intendedBelowIn),
                        })
                      : "—"}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}

function PlantsSection({ evidence, t }: Omit<SectionProps, "format">) {
  const dash = t("page.plants.missing");
  const v = (x: number | string | null) => (x === null ? dash : typeof x === "number" ? num(x) : x);
  const columns = [
    "stage",
    "seedingDepth",
    "crownDepth",
    "mesocotyl",
    "seminalScore",
    "nodalWhorls",
    "nodalCount",
    "longestNodal",
    "seminalInjury",
    "nodalInjury",
    "band",
    "findings",
    "rootIndex",
  ] as const;
  return (
    <section aria-labelledby="plants-heading" className="space-y-3">
      <h2 id="plants-heading">{t("page.plants.heading")}</h2>
      {evidence.plants.length === 0 ? (
        <p className="text-soil-700">{t("page.plants.none")}</p>
      ) : (
        <section
          className="overflow-x-auto rounded-card border border-soil-200 bg-white"
          aria-label={t("page.plants.caption")}
          // biome-ignore lint/a11y/noNoninteractiveTabindex: a scrollable table must be reachable by keyboard
          tabIndex={0}
        >
          <table className="w-full min-w-[60rem] text-left text-sm">
            <caption className="sr-only">{t("page.plants.caption")}</caption>
            <thead className="bg-soil-100">
              <tr>
                <th scope="col" className="px-3 py-2">
                  {t("page.plants.plant")}
                </th>
                {columns.map((c) => (
                  <th key={c} scope="col" className="px-3 py-2">
                    {t(`page.plants.${c}`)}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {evidence.plants.map((p, i) => (
                <tr key={p.id} className="border-t border-soil-200">
                  <th scope="row" className="px-3 py-2">
                    {i + 1}
                  </th>
                  <td className="px-3 py-2">{p.leafStage}</td>
                  <td className="px-3 py-2">{v(p.seedingDepthIn)}</td>
                  <td className="px-3 py-2">{v(p.crownDepthIn)}</td>
                  <td className="px-3 py-2">{v(p.mesocotyl)}</td>
                  <td className="px-3 py-2">{v(p.seminalScore)}</td>
                  <td className="px-3 py-2">{v(p.nodalWhorls)}</td>
                  <td className="px-3 py-2">{v(p.nodalCount)}</td>
                  <td className="px-3 py-2">{v(p.longestNodalIn)}</td>
                  <td className="px-3 py-2">{p.seminalInjury}</td>
                  <td className="px-3 py-2">{p.nodalInjury}</td>
                  <td className="px-3 py-2">
                    {p.bandBesideIn !== null && p.bandBelowIn !== null
                      ? `${num(p.bandBesideIn)} × ${num(p.bandBelowIn)}`
                      : dash}
                  </td>
                  <td className="px-3 py-2">
                    {p.findings.length ? p.findings.join(", ").replaceAll("_", " ") : dash}
                  </td>
                  <td className="px-3 py-2">{v(p.rootIndex)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      )}
    </section>
  );
}

function FindingList({
  findings,
  label,
}: {
  findings: readonly (Finding & { passIndex?: number })[];
  label: (f: Finding & { passIndex?: number }) => string | null;
}) {
  return (
    <ul className="space-y-3">
      {findings.map((f, i) => (
        <li key={`${f.code}-${i}`} className="rounded-card border border-soil-200 p-3" data-finding={f.code}>
          <div className="flex flex-wrap items-center gap-2">
            <SeverityBadge severity={f.severity} />
            {label(f) ? <span className="text-sm text-soil-700">{label(f)}</span> : null}
          </div>
          <p className="mt-1">{f.message}</p>
          {Object.keys(f.numbers).length > 0 ? (
            <dl className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-sm">
              {Object.entries(f.numbers).map(([k, q]) => (
                <div key={k} className="flex gap-1">
                  <dt className="text-soil-700">{k}:</dt>
                  <dd className="font-semibold">
                    {num(q.value)} {q.unit}
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

function AssessmentSection({ evidence, t }: Omit<SectionProps, "format">) {
  const a = evidence.assessment;
  return (
    <section aria-labelledby="assessment-heading" className="card space-y-4">
      <h2 id="assessment-heading">{t("page.assessment.heading")}</h2>
      <p className="text-sm text-soil-700">{t("page.assessment.intro")}</p>
      {!a ? (
        <p>{t("page.assessment.none")}</p>
      ) : (
        <>
          <Pairs
            pairs={[
              [
                t("page.assessment.siteIndex"),
                t("page.assessment.siteIndexValue", { value: num(a.siteIndex) }),
              ],
              [t("page.assessment.stage"), a.leafCollars === 0 ? "VE" : `V${a.leafCollars}`],
              [t("page.assessment.plantIndexes"), a.plants.map((p) => num(p.index)).join(", ")],
            ]}
          />
          {a.flagForReview.flag ? (
            <div className="notice-caution">
              <p className="font-semibold">{t("page.assessment.review")}</p>
              <p>{a.flagForReview.reason}</p>
            </div>
          ) : null}
          <h3 className="text-lg font-semibold">{t("page.assessment.audit")}</h3>
          {a.audit.length === 0 ? (
            <p className="text-soil-700">{t("page.assessment.auditNone")}</p>
          ) : (
            <FindingList
              findings={a.audit}
              label={(f) =>
                f.passIndex === undefined ? null : t("page.assessment.pass", { n: f.passIndex + 1 })
              }
            />
          )}
          <h3 className="text-lg font-semibold">{t("page.assessment.flags")}</h3>
          {a.flags.length === 0 ? (
            <p className="text-soil-700">{t("page.assessment.flagsNone")}</p>
          ) : (
            <FindingList findings={a.flags} label={() => null} />
          )}
          <p className="text-sm text-soil-700">{t("page.passes.guidance")}</p>
        </>
      )}
    </section>
  );
}

const show = (v: unknown) =>
  v === null || v === undefined ? "—" : typeof v === "string" ? v : JSON.stringify(v);

function ConflictsSection({ evidence, t, format }: SectionProps) {
  return (
    <section aria-labelledby="conflicts-heading" className="space-y-3">
      <h2 id="conflicts-heading">{t("page.conflicts.heading")}</h2>
      {evidence.conflicts.length === 0 ? (
        <p className="text-soil-700">{t("page.conflicts.none")}</p>
      ) : (
        <section
          className="overflow-x-auto rounded-card border border-soil-200 bg-white"
          aria-label={t("page.conflicts.caption")}
          // biome-ignore lint/a11y/noNoninteractiveTabindex: a scrollable table must be reachable by keyboard
          tabIndex={0}
        >
          <table className="w-full min-w-[48rem] text-left text-sm">
            <caption className="sr-only">{t("page.conflicts.caption")}</caption>
            <thead className="bg-soil-100">
              <tr>
                <th scope="col" className="px-3 py-2">
                  {t("page.conflicts.record")}
                </th>
                <th scope="col" className="px-3 py-2">
                  {t("page.conflicts.field")}
                </th>
                <th scope="col" className="px-3 py-2">
                  {t("page.conflicts.server")}
                </th>
                <th scope="col" className="px-3 py-2">
                  {t("page.conflicts.client")}
                </th>
                <th scope="col" className="px-3 py-2">
                  {t("page.conflicts.received")}
                </th>
                <th scope="col" className="px-3 py-2">
                  {t("page.conflicts.settled")}
                </th>
              </tr>
            </thead>
            <tbody>
              {evidence.conflicts.map((c) => (
                <tr key={c.id} className="border-t border-soil-200 align-top">
                  <td className="px-3 py-2">
                    {["dig_site", "dug_plant", "photo"].includes(c.tableName)
                      ? t(`page.conflicts.table.${c.tableName as "dig_site" | "dug_plant" | "photo"}`)
                      : c.tableName}
                  </td>
                  <td className="px-3 py-2">{c.fieldName}</td>
                  <td className="px-3 py-2">
                    {show(c.serverValue)} ({c.serverUser ?? "—"})
                  </td>
                  <td className="px-3 py-2">
                    {show(c.clientValue)} ({c.clientUser ?? "—"})
                  </td>
                  <td className="px-3 py-2">{when(format, c.clientReceivedAt)}</td>
                  <td className="px-3 py-2">
                    {c.settledAt
                      ? t("page.conflicts.settledValue", {
                          value: show(c.settledValue),
                          name: c.settledBy ?? "—",
                          when: when(format, c.settledAt),
                        })
                      : t("page.conflicts.open")}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      )}
    </section>
  );
}

function eventDetail(e: CaseEvidence["events"][number], t: Translate): string | null {
  const p = (e.payload ?? {}) as Record<string, unknown>;
  const statusWord = (s: unknown) =>
    typeof s === "string" && ["new", "in_review", "decided", "closed"].includes(s)
      ? t(`status.${s as "new"}`)
      : String(s ?? "");
  switch (e.kind) {
    case "status":
      return t("page.timeline.statusChange", { from: statusWord(p.from), to: statusWord(p.to) });
    case "decision":
      return typeof p.decision === "string" &&
        p.decision in { injury_confirmed: 1, not_injury: 1, inconclusive: 1 }
        ? t("page.timeline.decisionValue", { decision: t(`decision.${p.decision as "not_injury"}`) })
        : null;
    case "shared":
      return p.shared ? t("page.timeline.sharedOn") : t("page.timeline.sharedOff");
    case "assigned":
      return e.assignee ? t("page.timeline.assignedTo", { name: e.assignee }) : t("page.timeline.unassigned");
    default:
      return null;
  }
}

function TimelineSection({ evidence, t, format }: SectionProps) {
  return (
    <section aria-labelledby="timeline-heading" className="card space-y-3">
      <h2 id="timeline-heading">{t("page.timeline.heading")}</h2>
      {evidence.events.length === 0 ? (
        <p className="text-soil-700">{t("page.timeline.none")}</p>
      ) : (
        <ol className="space-y-3 border-l-4 border-soil-200 pl-4">
          {evidence.events.map((e) => {
            const detail = eventDetail(e, t);
            return (
              <li key={e.id} data-event-kind={e.kind}>
                <p>
                  <span className="font-semibold">{e.actor?.name ?? t("page.timeline.system")}</span>{" "}
                  {t(`page.timeline.event.${e.kind}`)}{" "}
                  <time dateTime={e.createdAt} className="text-sm text-soil-700">
                    {when(format, e.createdAt)}
                  </time>
                </p>
                {detail ? <p className="text-sm">{detail}</p> : null}
                {e.body ? <p className="whitespace-pre-line">{e.body}</p> : null}
              </li>
            );
          })}
        </ol>
      )}
    </section>
  );
}
