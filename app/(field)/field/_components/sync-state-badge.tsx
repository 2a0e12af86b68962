import { useTranslations } from "next-intl";
import type { DigDisplayState } from "./use-local-digs";

const line = { fill: "none", stroke: "currentColor", strokeWidth: 2.5, strokeLinecap: "round" } as const;

// Each state has its own shape as well as its own word and colour, so it reads in sunlight, in
// greyscale and to a colour-blind rep.
const LOOK: Record<DigDisplayState, { className: string; shape: React.ReactNode }> = {
  local: {
    className: "border-soil-700 bg-soil-100",
    shape: (
      <>
        <rect x="7" y="3" width="10" height="18" rx="2" {...line} />
        <path d="M11 17.5h2" {...line} />
      </>
    ),
  },
  waiting: {
    className: "border-water-700 bg-water-50",
    shape: (
      <>
        <circle cx="12" cy="12" r="8.5" {...line} />
        <path d="M12 7v5l3 2" {...line} />
      </>
    ),
  },
  synced: {
    className: "border-sprout-700 bg-sprout-50",
    shape: (
      <>
        <circle cx="12" cy="12" r="9.5" fill="currentColor" />
        <path d="m7.5 12.5 3 3 6-6.5" {...line} stroke="white" />
      </>
    ),
  },
  conflict: {
    className: "border-caution-700 bg-caution-50",
    shape: (
      <>
        <path d="M12 3 22 20H2Z" {...line} strokeLinejoin="round" />
        <path d="M12 9.5v4.5M12 17h.01" {...line} />
      </>
    ),
  },
  rejected: {
    className: "border-burn-700 bg-burn-50",
    shape: (
      <>
        <path d="M8 2.5h8l5.5 5.5v8L16 21.5H8L2.5 16V8Z" fill="currentColor" />
        <path d="m9 9 6 6M15 9l-6 6" {...line} stroke="white" />
      </>
    ),
  },
};

export function SyncStateBadge({ state }: { state: DigDisplayState }) {
  const t = useTranslations("field.digs.state");
  const look = LOOK[state];
  return (
    <span
      className={`inline-flex items-center gap-1.5 rounded-full border-2 px-2.5 py-0.5 text-sm font-bold text-soil-900 ${look.className}`}
    >
      <svg viewBox="0 0 24 24" width="18" height="18" aria-hidden="true" className="shrink-0">
        {look.shape}
      </svg>
      {t(state)}
    </span>
  );
}
