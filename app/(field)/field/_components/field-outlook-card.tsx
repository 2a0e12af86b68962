"use client";

import { useFormatter, useTranslations } from "next-intl";
import type { FieldOutlook } from "./field-outlook";

const line = { fill: "none", stroke: "currentColor", strokeWidth: 2.5, strokeLinecap: "round" } as const;

type WindowLook = "digNow" | "inIrrigated" | "before" | "after";

// Shape, word and colour for the dig window, so it reads without colour.
const WINDOW_LOOK: Record<WindowLook, { className: string; shape: React.ReactNode }> = {
  digNow: {
    className: "border-sprout-900 bg-sprout-700 text-white",
    shape: (
      <>
        <path d="M12 3v12" {...line} />
        <path d="m7 10 5 5 5-5" {...line} />
        <path d="M4 20h16" {...line} />
      </>
    ),
  },
  inIrrigated: {
    className: "border-water-700 bg-water-50 text-soil-900",
    shape: <path d="M12 3c3.5 4.5 6 7.8 6 11a6 6 0 0 1-12 0c0-3.2 2.5-6.5 6-11Z" {...line} />,
  },
  before: {
    className: "border-soil-700 bg-soil-100 text-soil-900",
    shape: <path d="M5 12h12M12 6l6 6-6 6" {...line} />,
  },
  after: {
    className: "border-soil-700 bg-white text-soil-900",
    shape: <rect x="5" y="5" width="14" height="14" rx="1.5" {...line} />,
  },
};

// An ISO calendar date shown as a day of the year ("May 2"); calendar dates have no time zone.
function useDay() {
  const format = useFormatter();
  return (iso: string) =>
    format.dateTime(new Date(`${iso}T12:00:00Z`), { month: "short", day: "numeric", timeZone: "UTC" });
}

export function FieldOutlookCard({ outlook }: { outlook: FieldOutlook }) {
  const t = useTranslations("field.today");
  const day = useDay();
  const { field, status } = outlook;
  return (
    <li className="card">
      <div className="flex flex-wrap items-baseline justify-between gap-x-3">
        <h3 className="text-lg font-bold">{field.name}</h3>
        {outlook.accountName ? <span className="text-soil-700">{outlook.accountName}</span> : null}
      </div>
      {status.kind === "stage" ? (
        <StageLines outlook={outlook} status={status} />
      ) : (
        <p className="mt-2">
          {status.kind === "noPlanting"
            ? t("noPlanting")
            : status.kind === "notPlantedYet"
              ? t("notPlantedYet", { date: day(status.plantedOn) })
              : status.kind === "noWeather"
                ? t("noWeather")
                : t("stageError", { message: status.message })}
        </p>
      )}
    </li>
  );
}

function StageLines({
  outlook,
  status,
}: {
  outlook: FieldOutlook;
  status: Extract<FieldOutlook["status"], { kind: "stage" }>;
}) {
  const t = useTranslations("field.today");
  const day = useDay();
  const w = status.window;
  const look: WindowLook = w.digNow ? "digNow" : w.position === "in" ? "inIrrigated" : w.position;
  const when =
    w.position === "before" && w.opensOn
      ? t("window.opens", { date: day(w.opensOn.date) })
      : w.position === "after" && w.closesOn
        ? t("window.closed", { date: day(w.closesOn.date) })
        : null;
  return (
    <>
      <p className="mt-1 flex flex-wrap items-center gap-2">
        <span className="text-2xl font-bold">
          {w.stage === "planted" ? t("planted") : t("stage", { stage: w.stage })}
        </span>
        {status.projected ? (
          <span className="rounded border-2 border-dashed border-soil-700 px-2 text-sm font-bold">
            {t("projected")}
          </span>
        ) : null}
      </p>
      <p className="text-soil-700">
        {t("gdd", { gdd: Math.round(w.gddF), date: day(status.plantedOn) })}
        {outlook.hybrids.length > 0 ? ` · ${t("hybrid", { hybrids: outlook.hybrids.join(", ") })}` : null}
      </p>
      <p className="mt-2 flex flex-wrap items-center gap-2">
        <span
          className={`inline-flex items-center gap-1.5 rounded-full border-2 px-3 py-1 font-bold ${WINDOW_LOOK[look].className}`}
        >
          <svg viewBox="0 0 24 24" width="20" height="20" aria-hidden="true" className="shrink-0">
            {WINDOW_LOOK[look].shape}
          </svg>
          {t(`window.${look}`)}
        </span>
        {when ? <span>{when}</span> : null}
      </p>
      <p className="mt-1 text-sm">
        {outlook.field.firstIrrigationOn && w.irrigated
          ? t("window.irrigatedOn", { date: day(outlook.field.firstIrrigationOn) })
          : t("window.notIrrigated")}
      </p>
      {status.projected ? (
        <p className="mt-1 text-sm text-soil-700">
          {t("projectedHint", { date: day(status.weatherEndsOn) })}
        </p>
      ) : !w.complete ? (
        <p className="mt-1 text-sm text-soil-700">{t("incomplete")}</p>
      ) : null}
    </>
  );
}
