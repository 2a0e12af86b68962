import { getFormatter, getTranslations } from "next-intl/server";
import type { DigRootIndex } from "@/db/queries/field-agronomy";
import { CHART, dateScale, dateTicks, linear, PLOT } from "./chart";

// One look per hybrid: a shape and a colour from a palette that stays distinct for the common forms
// of colour blindness; the shape alone tells the series apart.
const LOOKS = [
  { shape: "circle", colour: "#0b63a3" },
  { shape: "square", colour: "#b35c00" },
  { shape: "triangle", colour: "#00775a" },
  { shape: "diamond", colour: "#a3396f" },
  { shape: "cross", colour: "#222222" },
  { shape: "triangleDown", colour: "#5c3c99" },
] as const;
type Shape = (typeof LOOKS)[number]["shape"];

export function Marker({
  shape,
  colour,
  cx,
  cy,
  size = 6,
}: {
  shape: Shape;
  colour: string;
  cx: number;
  cy: number;
  size?: number;
}) {
  const s = size;
  const common = { fill: colour, stroke: "#ffffff", strokeWidth: 1.5 };
  switch (shape) {
    case "circle":
      return <circle cx={cx} cy={cy} r={s} {...common} />;
    case "square":
      return <rect x={cx - s} y={cy - s} width={2 * s} height={2 * s} {...common} />;
    case "triangle":
      return (
        <path
          d={`M${cx} ${cy - s * 1.2} L${cx + s * 1.1} ${cy + s * 0.9} L${cx - s * 1.1} ${cy + s * 0.9} Z`}
          {...common}
        />
      );
    case "triangleDown":
      return (
        <path
          d={`M${cx} ${cy + s * 1.2} L${cx + s * 1.1} ${cy - s * 0.9} L${cx - s * 1.1} ${cy - s * 0.9} Z`}
          {...common}
        />
      );
    case "diamond":
      return (
        <path
          d={`M${cx} ${cy - s * 1.3} L${cx + s * 1.1} ${cy} L${cx} ${cy + s * 1.3} L${cx - s * 1.1} ${cy} Z`}
          {...common}
        />
      );
    case "cross":
      return (
        <path
          d={`M${cx - s} ${cy - s} L${cx + s} ${cy + s} M${cx + s} ${cy - s} L${cx - s} ${cy + s}`}
          stroke={colour}
          strokeWidth={3}
          fill="none"
        />
      );
  }
}

const isoDay = (d: Date) => d.toISOString().slice(0, 10);

export async function DigsPanel({ digs, headingId }: { digs: readonly DigRootIndex[]; headingId: string }) {
  const t = await getTranslations("fieldPage.panels.digs");
  const format = await getFormatter();
  const day = (iso: string) =>
    format.dateTime(new Date(`${iso}T12:00:00Z`), { month: "short", day: "numeric", timeZone: "UTC" });
  const number = (v: number) => format.number(v, { maximumFractionDigits: 1 });
  if (digs.length === 0) return <p className="mt-2">{t("empty")}</p>;

  const label = (hybrid: string | null) => hybrid ?? t("noHybrid");
  const hybrids = [...new Set(digs.map((d) => label(d.hybrid)))].sort();
  const lookOf = new Map(hybrids.map((h, i) => [h, LOOKS[i % LOOKS.length]!]));
  const dates = digs.map((d) => isoDay(d.dugAt)).sort();
  const first = dates[0]!;
  const last = dates.at(-1)!;
  // A single day still gets a visible span.
  const spanEnd =
    first === last ? new Date(Date.parse(`${last}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10) : last;
  const spanStart =
    first === last
      ? new Date(Date.parse(`${first}T00:00:00Z`) - 86_400_000).toISOString().slice(0, 10)
      : first;
  const x = dateScale(spanStart, spanEnd);
  const y = linear([0, 100], [PLOT.y0, PLOT.y1]);
  const titleId = `${headingId}-title`;
  const descId = `${headingId}-desc`;
  const counts = hybrids.map((h) => ({ hybrid: h, n: digs.filter((d) => label(d.hybrid) === h).length }));

  return (
    <>
      <figure className="mt-3">
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
              {t("chartDesc", {
                digs: digs.length,
                hybrids: hybrids.length,
                first: day(first),
                last: day(last),
              })}
            </desc>
            {[0, 20, 40, 60, 80, 100].map((v) => (
              <g key={v}>
                <line x1={PLOT.x0} x2={PLOT.x1} y1={y(v)} y2={y(v)} className="stroke-soil-200" />
                <text x={PLOT.x0 - 6} y={y(v) + 4} textAnchor="end" className="fill-current text-[13px]">
                  {v}
                </text>
              </g>
            ))}
            {dateTicks(spanStart, spanEnd).map((d) => (
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
            {digs.map((d) => {
              const look = lookOf.get(label(d.hybrid))!;
              return (
                <Marker
                  key={d.id}
                  shape={look.shape}
                  colour={look.colour}
                  cx={x(isoDay(d.dugAt))}
                  cy={y(d.rootIndex)}
                />
              );
            })}
          </svg>
        </section>
        <figcaption className="mt-2 text-sm">
          <p className="sr-only">{t("legendHeading")}</p>
          <ul className="flex flex-wrap gap-x-6 gap-y-2">
            {counts.map(({ hybrid, n }) => {
              const look = lookOf.get(hybrid)!;
              return (
                <li key={hybrid} className="flex items-center gap-2">
                  <svg viewBox="0 0 20 20" width="20" height="20" aria-hidden="true">
                    <Marker shape={look.shape} colour={look.colour} cx={10} cy={10} size={6} />
                  </svg>
                  {t("legendItem", { hybrid, shape: t(`shapes.${look.shape}`), n })}
                </li>
              );
            })}
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
                <th scope="col" className="px-2 py-1 text-left">
                  {t("tableHybrid")}
                </th>
                <th scope="col" className="px-2 py-1 text-right">
                  {t("tableIndex")}
                </th>
                <th scope="col" className="px-2 py-1 text-right">
                  {t("tablePlants")}
                </th>
              </tr>
            </thead>
            <tbody>
              {digs.map((d) => (
                <tr key={d.id} className="border-t border-soil-100">
                  <td className="px-2 py-1">{day(isoDay(d.dugAt))}</td>
                  <td className="px-2 py-1">{label(d.hybrid)}</td>
                  <td className="px-2 py-1 text-right tabular-nums">{number(d.rootIndex)}</td>
                  <td className="px-2 py-1 text-right tabular-nums">{d.plantCount}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      </details>
    </>
  );
}
