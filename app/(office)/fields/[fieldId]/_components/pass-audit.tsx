import { getTranslations } from "next-intl/server";
import type { Finding } from "@/lib/agronomy";
import type { AuditStatus, PassAudit } from "./records";

const STATUS_STYLE: Record<AuditStatus, string> = {
  ok: "border-sprout-700 bg-sprout-50 text-sprout-900",
  caution: "border-caution-500 bg-caution-50 text-caution-700",
  exceeds: "border-burn-700 bg-burn-50 text-burn-700",
};

const SEVERITY_STYLE: Record<Finding["severity"], string> = {
  info: "border-water-500 bg-water-50",
  caution: "border-caution-500 bg-caution-50",
  warning: "border-caution-700 bg-caution-50",
  critical: "border-burn-700 bg-burn-50",
};

const fmt = (x: number) => x.toLocaleString("en-US", { maximumFractionDigits: 2 });

/** One pass's placement audit: its result, each finding with its numbers, the limit and the sources. */
export async function PassAuditView({
  audit,
  plantingLabel,
  soilLabel,
  headingId,
}: {
  audit: PassAudit;
  plantingLabel: string | null;
  soilLabel: string | null;
  headingId: string;
}) {
  const t = await getTranslations("fieldPage.audit");
  if (audit.status === null) {
    const reason = audit.error
      ? t("error", { message: audit.error })
      : audit.plantingId === null
        ? t("noPlanting")
        : t("noProduct");
    return (
      <section aria-labelledby={headingId} className="mt-3">
        <h4 id={headingId} className="font-semibold">
          {t("title")}
        </h4>
        <p className="notice-caution mt-1">{reason}</p>
      </section>
    );
  }
  const limit = audit.findings.find((f) => f.numbers.limit)?.numbers;
  return (
    <section aria-labelledby={headingId} className="mt-3 space-y-2">
      <h4 id={headingId} className="font-semibold">
        {t("title")}
      </h4>
      <p
        className={`rounded-card border-l-8 p-3 ${STATUS_STYLE[audit.status]}`}
        data-audit-status={audit.status}
      >
        <span className="font-bold">
          {t("result")}: {t(`status.${audit.status}`)}
        </span>{" "}
        <span className="text-soil-900">{t(`statusHint.${audit.status}`)}</span>
      </p>
      {audit.plantingAssumed && plantingLabel ? (
        <p className="text-sm">{t("assumed", { hybrid: plantingLabel })}</p>
      ) : null}
      {limit?.limit && limit.rowSpacing ? (
        <p className="font-semibold">
          {t("limit", {
            value: fmt(limit.limit.value),
            spacing: fmt(limit.rowSpacing.value),
            soil: soilLabel ?? "",
          })}
        </p>
      ) : null}
      {audit.findings.length === 0 ? (
        <p>{t("noFindings")}</p>
      ) : (
        <ul className="space-y-2">
          {audit.findings.map((f) => (
            <li
              key={`${f.code}-${f.message}`}
              className={`rounded-lg border-l-8 p-3 ${SEVERITY_STYLE[f.severity]}`}
            >
              <p>
                <span className="font-bold">{t(`severity.${f.severity}`)}:</span> {f.message}
              </p>
              <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 text-sm">
                {Object.entries(f.numbers).map(([key, q]) => (
                  <div key={key} className="contents">
                    <dt>{t.has(`numbers.${key}`) ? t(`numbers.${key}` as "numbers.n") : key}</dt>
                    <dd className="font-semibold">
                      {fmt(q.value)} {q.unit}
                    </dd>
                  </div>
                ))}
              </dl>
            </li>
          ))}
        </ul>
      )}
      <p className="text-sm text-soil-700">{t("formula")}</p>
      <p className="text-sm text-soil-700">{t("source")}</p>
    </section>
  );
}
