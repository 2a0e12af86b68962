"use client";

import dynamic from "next/dynamic";
import type { BoundaryDrawMapProps } from "./boundary-draw-map";
import type { DigMapProps } from "./dig-map";
import { mapQuery, mapUrl, NO_FILTERS, prefetchMap, WORLD } from "./map-data";
import type { PointMapProps } from "./point-map";

// The maps run Leaflet, which needs the browser: each loads on the client only, with a placeholder of
// its height meanwhile. Tile props (tileUrl, tileAttribution) come from a server component's env.

function Placeholder({ height }: { height: string }) {
  return <div className="animate-pulse rounded-card border border-soil-200 bg-soil-100" style={{ height }} />;
}

const LazyDigMap = dynamic<DigMapProps>(() => import("./dig-map").then((m) => m.DigMap), {
  ssr: false,
  loading: () => <Placeholder height="32rem" />,
});

export function DigMap(props: DigMapProps) {
  // Without initial bounds the map first asks for everything in scope: start that request now.
  if (typeof window !== "undefined" && !props.initialBounds) {
    prefetchMap(mapUrl(WORLD, mapQuery({ accountId: props.accountId, fieldId: props.fieldId }, NO_FILTERS)));
  }
  return <LazyDigMap {...props} />;
}

export const PointMap = dynamic<PointMapProps>(() => import("./point-map").then((m) => m.PointMap), {
  ssr: false,
  loading: () => <Placeholder height="16rem" />,
});

export const BoundaryDrawMap = dynamic<BoundaryDrawMapProps>(
  () => import("./boundary-draw-map").then((m) => m.BoundaryDrawMap),
  { ssr: false, loading: () => <Placeholder height="24rem" /> },
);

export type { BoundaryDrawMapProps, DigMapProps, PointMapProps };
export type { PolygonGeometry } from "@/lib/geo/map-features";
