import { type Bounds, formatBounds } from "@/lib/geo/bounds";
import type { MapFeatureCollection } from "@/lib/geo/map-features";

// The map's requests. The first one (the whole world, to fit what comes back) starts as soon as the
// lazy map's wrapper renders, so it runs while the browser is still fetching Leaflet's code.

export const WORLD: Bounds = { west: -180, south: -90, east: 180, north: 90 };

export interface MapFilterValues {
  from: string;
  to: string;
  hybrid: string;
  stage: string;
  flagged: boolean;
  accountId: string;
}

export const NO_FILTERS: MapFilterValues = {
  from: "",
  to: "",
  hybrid: "",
  stage: "",
  flagged: false,
  accountId: "",
};

/** The query after bbox= for the fixed scope (props) and the filters; the same inputs give the same string. */
export function mapQuery(
  scope: { accountId?: string; fieldId?: string },
  f: MapFilterValues,
  rangeError = false,
) {
  const q = new URLSearchParams();
  if (scope.accountId) q.set("accountId", scope.accountId);
  else if (f.accountId) q.set("accountId", f.accountId);
  if (scope.fieldId) q.set("fieldId", scope.fieldId);
  if (!rangeError) {
    if (f.from) q.set("from", f.from);
    if (f.to) q.set("to", f.to);
  }
  if (f.hybrid.trim()) q.set("hybrid", f.hybrid.trim());
  if (f.stage) q.set("stage", f.stage);
  if (f.flagged) q.set("flagged", "1");
  return q.toString();
}

export const mapUrl = (bounds: Bounds, query: string) =>
  `/api/map?bbox=${formatBounds(bounds)}${query ? `&${query}` : ""}`;

async function getMap(url: string, signal?: AbortSignal): Promise<MapFeatureCollection> {
  const res = await fetch(url, { signal, headers: { accept: "application/json" } });
  if (!res.ok) throw new Error(`The map request answered ${res.status}.`);
  return (await res.json()) as MapFeatureCollection;
}

const PREFETCH_FRESH_MS = 10_000;
const prefetched = new Map<string, { at: number; data: Promise<MapFeatureCollection> }>();

/** Starts a request early; the map takes it with fetchMap within a few seconds, else asks again. */
export function prefetchMap(url: string) {
  const have = prefetched.get(url);
  if (have && Date.now() - have.at < PREFETCH_FRESH_MS) return;
  const data = getMap(url);
  data.catch(() => prefetched.delete(url));
  prefetched.set(url, { at: Date.now(), data });
}

export function fetchMap(url: string, signal: AbortSignal): Promise<MapFeatureCollection> {
  const early = prefetched.get(url);
  prefetched.delete(url);
  if (early && Date.now() - early.at < PREFETCH_FRESH_MS) return early.data;
  return getMap(url, signal);
}
