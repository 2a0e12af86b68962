import { getFormatter, getTranslations } from "next-intl/server";
import { CHART, dateScale, dateTicks, linear, niceTicks, PLOT, pathOf } from "./chart";
import type { GddPanelData, GddSeries } from "./gdd-data";

// Line styles per planting date: the current planting solid and thick, others thinner with their own
// dash so the lines part without colour.
const OTHER_DASH = ["2 3", "8 3 2 3", "1 2"];

export async function GddPanel({ data, headingId }: { data: GddPanelData; headingId: string }) {
  const t = await getTranslations("fieldPage.panels.gdd");
  const format = await getFormatter();
  const day = (iso: string) =>
    format.dateTime(new Date(`${iso}T12:00:00Z`), { month: "short", day: "numeric", timeZone: "UTC" });
  const gdd = (v: number) => format.number(v, { maximumFractionDigits: 0 });

  if (data.kind !== "curve") {
    return (
      <p className="mt-2">
        {data.kind === "noPlanting"
          ? t("noPlanting")
          : data.kind === "notPlantedYet"
            ? t("notPlantedYet", { date: day(data.plantedOn) })
            : data.kind === "noWeather"
              ? t("noWeather")
              : t("error", { message: data.message })}
      </p>
    );
  }

  const w = data.window;
  const current = data.series.find((s) => s.current) ?? data.series[0];
  const first = data.series.map((s) => s.plantedOn).sort()[0] ?? data.plantedOn;
  const maxGdd = Math.max(data.v7GddF, ...data.series.flatMap((s) => s.points.map((p) => p.cumulativeGddF)));
  const yTicks = niceTicks(maxGdd);
  const yMax = yTicks.at(-1) ?? maxGdd;
  const x = dateScale(first, data.end);
  const y = linear([0, yMax], [PLOT.y0, PLOT.y1]);
  const todayPoint = current?.points.find((p) => p.date === data.today);
  const opens = w.opensOn?.date;
  const closes = w.closesOn?.date;
  const clampDate = (iso: string) => (iso < first ? first : iso > data.end ? data.end : iso);
  const titleId = `${headingId}-title`;
  const descId = `${headingId}-desc`;
  const stageText = w.stage === "planted" ? t("plantedStage") : w.stage;
  const summary = t("summary", {
    stage: stageText,
    gdd: gdd(w.gddF),
    date: day(data.today),
    projected: data.todayProjected ? "yes" : "no",
  });
  const windowText =
    opens && closes
      ? t("windowDates", { opens: day(opens), closes: day(closes) })
      : opens
        ? t("windowOpensOnly", { opens: day(opens) })
        : t("windowUnknown");

  return (
    <>
      <p className="mt-2 text-lg font-semibold">{summary}</p>
      <p className="mt-1">
        {windowText} {w.projected ? t("windowProjected") : null}
      </p>
      <p className="mt-1 text-sm text-soil-700">
        {t("weatherEnds", { date: day(data.weatherEndsOn) })}{" "}
        {data.normalGddPerDay !== undefined
          ? t("projectionRule", { gdd: format.number(data.normalGddPerDay, { maximumFractionDigits: 1 }) })
          : null}
      </p>
      {w.digNow ? <p className="notice-ok mt-2 font-semibold">{t("digNow")}</p> : null}
      {w.irrigated ? <p className="notice-caution mt-2">{t("irrigated")}</p> : null}
      <figure className="mt-4">
        <section
          className="overflow-x-auto"
          aria-label={t("chartScroll")}
          // biome-ignore lint/a11y/noNoninteractiveTabindex: a scrollable chart must be reachable by keyboard
          tabIndex={0}
        >
          <svg
            viewBox={`0 0 ${CHART.width} ${CHART.height}`}
            role="img"
            aria-labelledby={`${titleId} ${descId}`}
            className="h-auto w-full min-w-[36rem] max-w-3xl text-soil-900"
          >
            <title id={titleId}>{t("chartTitle")}</title>
            <desc id={descId}>
              {summary} {windowText}
            </desc>
            {opens ? (
              <g>
                <rect
                  x={x(clampDate(opens))}
                  y={PLOT.y1}
                  width={Math.max(2, x(clampDate(closes ?? data.end)) - x(clampDate(opens)))}
                  height={PLOT.y0 - PLOT.y1}
                  className="fill-sprout-100"
                />
                <text
                  x={x(clampDate(opens)) + 4}
                  y={PLOT.y1 + 14}
                  className="fill-sprout-900 text-[14px] font-semibold"
                >
                  {t("windowLabel")}
                </text>
              </g>
            ) : null}
            {yTicks.map((v) => (
              <g key={v}>
                <line
                  x1={PLOT.x0}
                  x2={PLOT.x1}
                  y1={y(v)}
                  y2={y(v)}
                  className="stroke-soil-200"
                  strokeWidth={1}
                />
                <text x={PLOT.x0 - 6} y={y(v) + 4} textAnchor="end" className="fill-current text-[13px]">
                  {gdd(v)}
                </text>
              </g>
            ))}
            {dateTicks(first, data.end).map((d) => (
              <g key={d}>
                <line x1={x(d)} x2={x(d)} y1={PLOT.y0} y2={PLOT.y0 + 5} className="stroke-current" />
                <text x={x(d)} y={PLOT.y0 + 18} textAnchor="middle" className="fill-current text-[13px]">
                  {day(d)}
                </text>
              </g>
            ))}
            <line x1={PLOT.x0} x2={PLOT.x1} y1={PLOT.y0} y2={PLOT.y0} className="stroke-current" />
            <line x1={PLOT.x0} x2={PLOT.x0} y1={PLOT.y0} y2={PLOT.y1} className="stroke-current" />
            <text
              x={(PLOT.x0 + PLOT.x1) / 2}
              y={CHART.height - 8}
              textAnchor="middle"
              className="fill-current text-[14px]"
            >
              {t("xAxis")}
            </text>
            <text
              transform={`translate(14 ${(PLOT.y0 + PLOT.y1) / 2}) rotate(-90)`}
              textAnchor="middle"
              className="fill-current text-[14px]"
            >
              {t("yAxis")}
            </text>
            {data.series.map((s, i) => (
              <SeriesLines
                key={s.plantedOn}
                series={s}
                x={x}
                y={y}
                dash={s.current ? undefined : OTHER_DASH[i % OTHER_DASH.length]}
              />
            ))}
            {current ? <ProjectedLabel series={current} x={x} y={y} label={t("projectedLabel")} /> : null}
            {todayPoint ? (
              <g>
                <line
                  x1={x(data.today)}
                  x2={x(data.today)}
                  y1={PLOT.y0}
                  y2={PLOT.y1}
                  className="stroke-soil-700"
                  strokeDasharray="3 3"
                />
                <circle
                  cx={x(data.today)}
                  cy={y(todayPoint.cumulativeGddF)}
                  r={6}
                  className="fill-white stroke-soil-900"
                  strokeWidth={2.5}
                />
                <text
                  // Above and left of the point, clear of the rising line; right of it near the left edge.
                  x={x(data.today) + (x(data.today) < PLOT.x0 + 120 ? 10 : -10)}
                  y={y(todayPoint.cumulativeGddF) - 12}
                  textAnchor={x(data.today) < PLOT.x0 + 120 ? "start" : "end"}
                  className="fill-current text-[14px] font-bold"
                >
                  {t("todayLabel", { stage: stageText })}
                </text>
              </g>
            ) : null}
          </svg>
        </section>
        <figcaption className="mt-2 text-sm">
          <ul className="flex flex-wrap gap-x-6 gap-y-1">
            {data.series.map((s) => (
              <li key={s.plantedOn}>
                {t(s.current ? "legendCurrent" : "legendOther", {
                  date: day(s.plantedOn),
                  hybrids: s.hybrids.join(", "),
                })}
              </li>
            ))}
            <li>{t("legendProjected")}</li>
            <li>{t("legendWindow")}</li>
          </ul>
        </figcaption>
      </figure>
      <details className="mt-3">
        <summary className="cursor-pointer py-2 font-semibold">{t("tableSummary")}</summary>
        <section
          className="overflow-x-auto"
          aria-label={t("tableSummary")}
          // biome-ignore lint/a11y/noNoninteractiveTabindex: a scrollable table must be reachable by keyboard
          tabIndex={0}
        >
          <table className="min-w-full text-sm">
            <caption className="text-left text-soil-700">{t("tableCaption")}</caption>
            <thead>
              <tr>
                <th scope="col" className="px-2 py-1 text-left">
                  {t("tableDate")}
                </th>
                {data.series.map((s) => (
                  <th key={s.plantedOn} scope="col" className="px-2 py-1 text-right">
                    {t("tablePlanted", { date: day(s.plantedOn) })}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {tableDates(data.series).map((d) => (
                <tr key={d} className="border-t border-soil-100">
                  <th scope="row" className="px-2 py-1 text-left font-normal">
                    {day(d)}
                    {d === data.today ? ` (${t("todayWord")})` : ""}
                  </th>
                  {data.series.map((s) => {
                    const p = s.points.find((q) => q.date === d);
                    return (
                      <td key={s.plantedOn} className="px-2 py-1 text-right tabular-nums">
                        {p ? `${gdd(p.cumulativeGddF)}${p.projected ? ` ${t("projectedMark")}` : ""}` : "—"}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      </details>
      <p className="notice-caution mt-3 text-sm">{t("caution")}</p>
    </>
  );
}

function tableDates(series: readonly GddSeries[]): string[] {
  return [...new Set(series.flatMap((s) => s.points.map((p) => p.date)))].sort();
}

type Scale = (v: number) => number;
type DateScale = (iso: string) => number;

function SeriesLines({ series, x, y, dash }: { series: GddSeries; x: DateScale; y: Scale; dash?: string }) {
  const observed = series.points.filter((p) => !p.projected);
  const lastObserved = observed.at(-1);
  const projected = series.points.filter((p) => p.projected);
  const width = dash ? 2 : 3.5;
  return (
    <g className="fill-none stroke-sprout-900">
      {observed.length > 0 ? (
        <path
          d={pathOf(observed.map((p) => [x(p.date), y(p.cumulativeGddF)]))}
          strokeWidth={width}
          strokeDasharray={dash}
        />
      ) : null}
      {projected.length > 0 ? (
        <path
          d={pathOf(
            [...(lastObserved ? [lastObserved] : []), ...projected].map((p) => [
              x(p.date),
              y(p.cumulativeGddF),
            ]),
          )}
          strokeWidth={width}
          strokeDasharray="10 6"
          className="stroke-soil-700"
        />
      ) : null}
    </g>
  );
}

function ProjectedLabel({
  series,
  x,
  y,
  label,
}: {
  series: GddSeries;
  x: DateScale;
  y: Scale;
  label: string;
}) {
  const last = series.points.at(-1);
  if (!last?.projected) return null;
  return (
    <text
      x={x(last.date) - 4}
      y={y(last.cumulativeGddF) + 18}
      textAnchor="end"
      className="fill-soil-700 text-[14px] italic"
    >
      {label}
    </text>
  );
}
