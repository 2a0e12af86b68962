import Link from "next/link";
import { getFormatter, getTranslations } from "next-intl/server";
import {
  listDigPhotos,
  listRecentRecommendations,
  listRecommendationResponses,
} from "@/db/queries/dig-detail";
import {
  digTableSpec,
  fieldTableSpec,
  listDigTable,
  listFieldTable,
  listGrownAccountIds,
} from "@/db/queries/tables";
import type { Actor } from "@/lib/auth/permissions";
import { stageOfCollars } from "@/lib/digs/assessment";
import { env } from "@/lib/env";
import { presignedGetUrl } from "@/lib/storage/s3";
import { parseTableQuery } from "@/lib/tables/params";
import { DigMap } from "./map";
import { RecommendationResponses } from "./recommendation-responses";

const RECENT_DIGS = 6;
const RECOMMENDATIONS = 5;

/** A grower's home: their farm's map, fields, recent digs with photos, their rep's advice and reports. */
export async function GrowerHome({ user }: { user: Actor }) {
  const t = await getTranslations("grower.home");
  const tc = await getTranslations("office.common");
  const format = await getFormatter();
  const accountIds = await listGrownAccountIds(user.id);
  if (accountIds.length === 0) {
    return (
      <section aria-labelledby="home-heading" className="space-y-4">
        <h1 id="home-heading">{t("heading")}</h1>
        <p className="notice-caution">{t("noFarm")}</p>
      </section>
    );
  }
  const [fields, digs, recommendations] = await Promise.all([
    listFieldTable(user, parseTableQuery({ pageSize: "100" }, fieldTableSpec)),
    listDigTable(user, parseTableQuery({}, { ...digTableSpec, pageSizes: [RECENT_DIGS] })),
    listRecentRecommendations(user, RECOMMENDATIONS),
  ]);
  const [photos, responses] = await Promise.all([
    listDigPhotos(digs.rows.map((d) => d.id)),
    listRecommendationResponses(recommendations.map((r) => r.digSiteId)),
  ]);
  // One thumbnail per dig: its first photo, through a short-lived link.
  const thumbs = new Map<string, { url: string; isIllustration: boolean }>();
  const photoCount = new Map<string, number>();
  for (const p of photos) photoCount.set(p.digSiteId, (photoCount.get(p.digSiteId) ?? 0) + 1);
  await Promise.all(
    digs.rows.map(async (d) => {
      const first = photos.find((p) => p.digSiteId === d.id);
      if (first) {
        const { url } = await presignedGetUrl(first.objectKey);
        thumbs.set(d.id, { url, isIllustration: first.isIllustration });
      }
    }),
  );
  const day = (d: Date) => format.dateTime(d, { dateStyle: "medium" });

  return (
    <div className="space-y-8">
      <header className="space-y-1">
        <h1 id="home-heading">{t("heading")}</h1>
        <p className="text-soil-700">{t("intro")}</p>
      </header>

      <section aria-labelledby="grower-map" className="space-y-2">
        <h2 id="grower-map">{t("map")}</h2>
        <p className="text-soil-700">{t("mapIntro")}</p>
        <DigMap
          accountId={accountIds.length === 1 ? accountIds[0] : undefined}
          height="24rem"
          tileUrl={env.MAP_TILE_URL}
          tileAttribution={env.MAP_TILE_ATTRIBUTION}
        />
      </section>

      <section aria-labelledby="grower-fields" className="space-y-2">
        <h2 id="grower-fields">{t("fields")}</h2>
        {fields.rows.length === 0 ? (
          <p className="text-soil-700">{t("noFields")}</p>
        ) : (
          <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
            {fields.rows.map((f) => (
              <li key={f.id} className="card">
                <h3 className="text-lg font-bold">
                  <Link className="underline" href={`/fields/${f.id}`}>
                    {f.name}
                  </Link>
                </h3>
                <p>
                  {f.areaAcres === null
                    ? null
                    : `${tc("acres", { value: format.number(f.areaAcres, { maximumFractionDigits: 1 }) })} · `}
                  {t("fieldLine", { digs: f.digCount })}
                </p>
                {f.hybrids.length ? (
                  <p className="text-sm text-soil-700">{t("hybrids", { names: f.hybrids.join(", ") })}</p>
                ) : null}
                {f.lastRootIndex !== null ? (
                  <p className="text-sm text-soil-700">
                    {t("lastIndex", { index: format.number(f.lastRootIndex, { maximumFractionDigits: 1 }) })}
                  </p>
                ) : null}
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="grower-digs" className="space-y-2">
        <h2 id="grower-digs">{t("digs")}</h2>
        {digs.rows.length === 0 ? (
          <p className="text-soil-700">{t("noDigs")}</p>
        ) : (
          <>
            <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
              {digs.rows.map((d) => {
                const thumb = thumbs.get(d.id);
                const date = day(d.dugAt);
                return (
                  <li key={d.id} className="card flex flex-col gap-2 p-3">
                    {thumb ? (
                      // biome-ignore lint/performance/noImgElement: short-lived presigned links to the bucket, not optimisable
                      <img
                        src={thumb.url}
                        alt={
                          thumb.isIllustration
                            ? t("thumbIllustrationAlt", { field: d.fieldName, date })
                            : t("thumbAlt", { field: d.fieldName, date })
                        }
                        loading="lazy"
                        className="h-40 w-full rounded bg-soil-100 object-contain"
                      />
                    ) : null}
                    <h3 className="text-lg font-bold">
                      <Link className="underline" href={`/digs/${d.id}`}>
                        {t("digTitle", { field: d.fieldName, date })}
                      </Link>
                    </h3>
                    <p className="text-sm">
                      {t("digLine", {
                        hybrid: d.hybrid ?? tc("none"),
                        stage: d.leafCollars === null ? tc("none") : stageOfCollars(d.leafCollars),
                        index:
                          d.rootIndex === null
                            ? tc("none")
                            : format.number(d.rootIndex, { maximumFractionDigits: 1 }),
                      })}
                    </p>
                    <p className="text-sm text-soil-700">
                      {t("photosOfDig", { count: photoCount.get(d.id) ?? 0 })} ·{" "}
                      {tc("flagCount", { count: d.flagCount })}
                    </p>
                  </li>
                );
              })}
            </ul>
            <Link className="btn-secondary" href="/digs">
              {t("allDigs")}
            </Link>
          </>
        )}
      </section>

      <section aria-labelledby="grower-recommendations" className="space-y-2">
        <h2 id="grower-recommendations">{t("recommendations")}</h2>
        {recommendations.length === 0 ? (
          <p className="text-soil-700">{t("noRecommendations")}</p>
        ) : (
          <ul className="space-y-4">
            {recommendations.map((r) => {
              const mine = responses.filter((x) => x.digSiteId === r.digSiteId);
              return (
                <li key={r.digSiteId} className="card">
                  <p className="text-sm text-soil-700">
                    <Link className="underline" href={`/digs/${r.digSiteId}`}>
                      {t("from", { rep: r.repName ?? tc("none"), field: r.fieldName, date: day(r.dugAt) })}
                    </Link>
                  </p>
                  <blockquote className="mt-2 border-l-4 border-sprout-700 pl-4 whitespace-pre-line">
                    {r.recommendation}
                  </blockquote>
                  <RecommendationResponses
                    digSiteId={r.digSiteId}
                    responses={mine.map((x) => ({
                      id: x.id,
                      userName: x.userName,
                      userRole: x.userRole,
                      kind: x.kind,
                      body: x.body,
                      createdAt: x.createdAt.toISOString(),
                    }))}
                    canAcknowledge
                    acknowledged={mine.some((x) => x.kind === "acknowledged" && x.userId === user.id)}
                    canComment
                  />
                </li>
              );
            })}
          </ul>
        )}
      </section>

      <section aria-labelledby="grower-reports" className="card space-y-2">
        <h2 id="grower-reports">{t("reports")}</h2>
        <p>{t("reportsIntro")}</p>
        <Link className="btn-primary" href="/reports">
          {t("openReports")}
        </Link>
      </section>
    </div>
  );
}
