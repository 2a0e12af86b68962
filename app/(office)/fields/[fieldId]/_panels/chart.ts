import { isoDateToDay } from "@/lib/agronomy";

// Plot geometry shared by the panels' inline SVG charts (viewBox units; the SVG scales to its box).
export const CHART = { width: 640, height: 320, left: 60, right: 20, top: 20, bottom: 56 } as const;
export const PLOT = {
  x0: CHART.left,
  x1: CHART.width - CHART.right,
  y0: CHART.height - CHART.bottom,
  y1: CHART.top,
} as const;

export function linear(domain: [number, number], range: [number, number]) {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const span = d1 - d0 || 1;
  return (v: number) => r0 + ((v - d0) / span) * (r1 - r0);
}

/** A scale from ISO dates to x. */
export function dateScale(first: string, last: string) {
  const scale = linear([isoDateToDay("first", first), isoDateToDay("last", last)], [PLOT.x0, PLOT.x1]);
  return (iso: string) => scale(isoDateToDay("date", iso));
}

/** About `count` round tick values from 0 to max. */
export function niceTicks(max: number, count = 5): number[] {
  if (!(max > 0)) return [0];
  const raw = max / count;
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * magnitude).find((s) => s >= raw) ?? raw;
  const ticks: number[] = [];
  for (let v = 0; v <= max + step / 2; v += step) ticks.push(Math.round(v * 1000) / 1000);
  return ticks;
}

/** ISO dates about every `everyDays` days from first to last, on the first of each step. */
export function dateTicks(first: string, last: string, maxTicks = 6): string[] {
  const a = isoDateToDay("first", first);
  const b = isoDateToDay("last", last);
  const step = Math.max(1, Math.ceil((b - a) / maxTicks / 7) * 7);
  const out: string[] = [];
  for (let d = a; d <= b; d += step) out.push(new Date(d * 86_400_000).toISOString().slice(0, 10));
  return out;
}

/** An SVG path through points. */
export function pathOf(points: readonly [number, number][]): string {
  return points.map(([x, y], i) => `${i === 0 ? "M" : "L"}${x.toFixed(1)} ${y.toFixed(1)}`).join(" ");
}
