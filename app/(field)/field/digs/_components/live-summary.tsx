"use client";

import { useFormatter, useTranslations } from "next-intl";
import { useMemo } from "react";
import type { Finding, Severity } from "@/lib/agronomy";
import {
  type AssessmentPass,
  type AssessmentPlanting,
  type AssessmentProduct,
  assessLocalDig,
  stageOfCollars,
} from "@/lib/digs/assessment";
import { type DigFormValues, plantForSummary, siteForSummary } from "@/lib/digs/form-schema";

const SEVERITY_STYLE: Record<Severity, string> = {
  info: "border-water-500 bg-water-50",
  caution: "border-caution-500 bg-caution-50",
  warning: "border-burn-500 bg-burn-50",
  critical: "border-burn-700 bg-burn-50",
};

// "plantsWithBurn" → "plants with burn": the agronomy core's number names, read aloud plainly.
const words = (key: string) => key.replace(/([a-z0-9])([A-Z])/g, "$1 $2").toLowerCase();

function FindingItem({ finding }: { finding: Finding }) {
  const t = useTranslations("dig.summary");
  const format = useFormatter();
  return (
    <li className={`rounded-lg border-l-8 p-3 ${SEVERITY_STYLE[finding.severity]}`}>
      <p>
        <span className="mr-2 rounded bg-soil-900 px-2 py-0.5 text-sm font-bold text-white uppercase">
          {t(`severity.${finding.severity}`)}
        </span>
        {finding.message}
      </p>
      {Object.keys(finding.numbers).length > 0 ? (
        <dl className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-sm text-soil-700">
          {Object.entries(finding.numbers).map(([key, q]) => (
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
  );
}

/**
 * What the dig says so far, recomputed on the phone as the rep types: the root development index
 * against the stage, each plant's index, the placement audit of the planting's passes and the injury
 * flags with their reasons, and whether the dig should go to a supervisor.
 */
export function LiveSummary({
  values,
  planting,
  passes,
  products,
}: {
  values: DigFormValues;
  planting: AssessmentPlanting | null;
  passes: readonly (AssessmentPass & { placement: string })[];
  products: readonly AssessmentProduct[];
}) {
  const t = useTranslations("dig.summary");
  const tPlant = useTranslations("dig.plant");

  const { entries, local } = useMemo(() => {
    const entries = values.plants.map((p, i) => ({ n: i + 1, plant: plantForSummary(p) }));
    const usable = entries.filter((e) => e.plant !== null);
    const local = assessLocalDig(
      siteForSummary(values),
      usable.map((e) => e.plant!),
      planting,
      passes,
      products,
    );
    return { entries: usable, local };
  }, [values, planting, passes, products]);

  const noStage = values.plants
    .map((p, i) => ({ p, n: i + 1 }))
    .filter(({ p }) => plantForSummary(p) === null);
  const a = local.assessment;
  const placementPasses = passes.filter(
    (p) =>
      p.fieldId === values.fieldId &&
      (planting === null || p.plantingId === null || p.plantingId === planting.id),
  );

  // Placement findings are listed once, under the placement audit; the flags list shows the rest.
  const auditKeys = new Set((a?.audit ?? []).map((f) => `${f.code}|${f.message}`));
  const rootFlags = (a?.flags ?? []).filter((f) => !auditKeys.has(`${f.code}|${f.message}`));

  return (
    <section
      aria-labelledby="summary-heading"
      className="mt-6 rounded-card border-2 border-sprout-700 bg-sprout-50 p-4"
    >
      <h2 id="summary-heading">{t("heading")}</h2>
      <p className="mt-1 text-sm text-soil-700">{t("intro")}</p>

      <div aria-live="polite" className="mt-3">
        {a ? (
          <div>
            <p className="text-lg">
              {t.rich("siteIndex", {
                index: a.siteIndex,
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
          </div>
        ) : (
          <p className="font-semibold">
            {local.error ? t("refused", { reason: local.error }) : t("waiting")}
          </p>
        )}
      </div>

      {entries.length > 0 || noStage.length > 0 ? (
        <>
          <h3 className="mt-4 text-lg font-bold">{t("plants")}</h3>
          <ul className="mt-1 space-y-1">
            {entries.map((e, k) => {
              const scoredAt = local.scoredPlants.indexOf(k);
              const result = scoredAt >= 0 ? a?.plants[scoredAt] : undefined;
              const missing = local.unscoredPlants.find((u) => u.index === k)?.missing ?? [];
              return (
                <li key={e.n}>
                  <span className="font-semibold">{tPlant("heading", { n: e.n })}</span>{" "}
                  {result
                    ? t("plantIndex", { stage: e.plant!.leafStage, index: result.index })
                    : missing.length > 0
                      ? t("plantMissing", {
                          missing: missing.map((m) => t(`measurement.${m}`)).join(", "),
                        })
                      : null}
                </li>
              );
            })}
            {noStage.map(({ n }) => (
              <li key={`nostage-${n}`}>
                <span className="font-semibold">{tPlant("heading", { n })}</span> {t("plantNoStage")}
              </li>
            ))}
          </ul>
        </>
      ) : null}

      {a ? (
        <>
          <h3 className="mt-4 text-lg font-bold">{t("flags")}</h3>
          {rootFlags.length === 0 ? (
            <p className="mt-1">{t("noFlags")}</p>
          ) : (
            <ul className="mt-2 space-y-2">
              {rootFlags.map((f, i) => (
                <FindingItem key={`${f.code}-${i}`} finding={f} />
              ))}
            </ul>
          )}

          <h3 className="mt-4 text-lg font-bold">{t("placement")}</h3>
          {planting === null ? (
            <p className="mt-1">{t("noPlanting")}</p>
          ) : a.audit.length === 0 ? (
            <p className="mt-1">{placementPasses.length === 0 ? t("noPasses") : t("noAuditFindings")}</p>
          ) : (
            <ul className="mt-2 space-y-2">
              {a.audit.map((f, i) => (
                <FindingItem key={`${f.code}-${i}`} finding={f} />
              ))}
            </ul>
          )}

          <div className={`mt-4 ${a.flagForReview.flag ? "notice-caution" : "notice-ok"}`}>
            <p className="font-bold">{a.flagForReview.flag ? t("reviewSuggested") : t("reviewNotNeeded")}</p>
            <p className="mt-1 text-sm">{a.flagForReview.reason}</p>
          </div>
        </>
      ) : null}
    </section>
  );
}
