import { useTranslations } from "next-intl";
import type { CaseSeverity } from "@/db/queries/case-view";
import type { CaseStatus } from "@/db/schema";

// Severity is told by its word and a shape, never by colour alone.
const SEVERITY_STYLE: Record<CaseSeverity | "info", { shape: string; className: string }> = {
  critical: { shape: "◆", className: "border-burn-700 bg-burn-50 text-burn-700" },
  warning: { shape: "▲", className: "border-caution-500 bg-caution-50 text-soil-900" },
  caution: { shape: "●", className: "border-soil-500 bg-soil-50 text-soil-900" },
  info: { shape: "○", className: "border-water-500 bg-white text-soil-900" },
};

export function SeverityBadge({ severity }: { severity: CaseSeverity | "info" }) {
  const t = useTranslations("cases.severity");
  const style = SEVERITY_STYLE[severity];
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded border-2 px-2 py-0.5 text-sm font-semibold ${style.className}`}
    >
      <span aria-hidden="true">{style.shape}</span>
      {t(severity)}
    </span>
  );
}

export function StatusBadge({ status }: { status: CaseStatus }) {
  const t = useTranslations("cases.status");
  const undecided = status === "new" || status === "in_review";
  return (
    <span
      className={`inline-flex whitespace-nowrap rounded px-2 py-0.5 text-sm font-semibold ${
        undecided ? "bg-soil-900 text-white" : "bg-soil-200 text-soil-900"
      }`}
    >
      {t(status)}
    </span>
  );
}
