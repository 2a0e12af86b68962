"use client";

import L from "leaflet";
import { useTranslations } from "next-intl";
import { useEffect, useId, useRef, useState } from "react";
import { MapContainer, useMap, useMapEvents } from "react-leaflet";
import type { LonLat, PolygonGeometry } from "@/lib/geo/map-features";
import { MapBase, type TileProps } from "./map-base";

export interface BoundaryDrawMapProps extends TileProps {
  /** The boundary to start from (its corners can be undone one by one). */
  initial?: PolygonGeometry | null;
  /** Called with the closed polygon on Finish, and with null on Clear. */
  onChange: (polygon: PolygonGeometry | null) => void;
  /** [latitude, longitude] to centre on when there is no initial boundary. */
  center?: [number, number];
  /** CSS height; default 24rem. */
  height?: string;
}

const round7 = (x: number) => Math.round(x * 1e7) / 1e7;

// Twice the signed area in degrees²: positive when the corners run counter-clockwise.
function signedArea(pts: readonly LonLat[]): number {
  let sum = 0;
  for (let i = 0; i < pts.length; i++) {
    const [x1, y1] = pts[i]!;
    const [x2, y2] = pts[(i + 1) % pts.length]!;
    sum += x1 * y2 - x2 * y1;
  }
  return sum;
}

/** A closed GeoJSON polygon from corners, counter-clockwise (RFC 7946 exterior ring). */
export function polygonFromCorners(corners: readonly LonLat[]): PolygonGeometry {
  const pts = corners.map(([lon, lat]) => [round7(lon), round7(lat)] as LonLat);
  if (signedArea(pts) < 0) pts.reverse();
  return { type: "Polygon", coordinates: [[...pts, [...pts[0]!] as LonLat]] };
}

function cornersOf(polygon: PolygonGeometry | null | undefined): LonLat[] {
  const ring = polygon?.coordinates[0] ?? [];
  const open = ring.length > 1 && ring[0]![0] === ring.at(-1)![0] && ring[0]![1] === ring.at(-1)![1];
  return (open ? ring.slice(0, -1) : ring).map(([lon, lat]) => [lon, lat] as LonLat);
}

/**
 * Draw a field boundary: a click (or "Add point at the centre" after panning with the arrow keys) adds
 * a corner; Undo point, Clear and Finish (at least 3 corners) are buttons.
 */
export function BoundaryDrawMap({
  initial,
  onChange,
  center,
  height = "24rem",
  tileUrl,
  tileAttribution,
}: BoundaryDrawMapProps) {
  const t = useTranslations("map.draw");
  const [corners, setCorners] = useState<LonLat[]>(() => cornersOf(initial));
  const [finished, setFinished] = useState(Boolean(initial));
  const mapRef = useRef<L.Map | null>(null);
  const statusId = useId();
  const add = (c: LonLat) => {
    setCorners((old) => [...old, c]);
    setFinished(false);
  };
  const start = cornersOf(initial);
  const startBounds =
    start.length > 0 ? L.latLngBounds(start.map(([lon, lat]) => [lat, lon] as [number, number])) : null;
  return (
    <div className="space-y-3">
      <div className="relative overflow-hidden rounded-card border border-soil-300" style={{ height }}>
        <MapContainer
          className="trench-map h-full w-full cursor-crosshair"
          {...(startBounds
            ? { bounds: startBounds, boundsOptions: { padding: [24, 24] as [number, number] } }
            : { center: center ?? [39.5, -98.35], zoom: center ? 15 : 4 })}
          minZoom={2}
          maxZoom={19}
          doubleClickZoom={false}
          ref={mapRef}
        >
          <MapBase tileUrl={tileUrl} tileAttribution={tileAttribution} label={t("mapLabel")} />
          <DrawLayer corners={corners} finished={finished} onAdd={add} />
        </MapContainer>
        {/* The centre the keyboard button adds. */}
        <span
          aria-hidden="true"
          className="pointer-events-none absolute top-1/2 left-1/2 z-[1000] -translate-x-1/2 -translate-y-1/2 text-2xl leading-none text-soil-900"
        >
          +
        </span>
      </div>
      <p id={statusId} aria-live="polite" className="font-semibold">
        {finished ? t("finished", { count: corners.length }) : t("status", { count: corners.length })}
      </p>
      <div className="flex flex-wrap gap-3" aria-describedby={statusId}>
        <button
          type="button"
          className="btn-secondary"
          onClick={() => {
            const c = mapRef.current?.getCenter();
            if (c) add([c.lng, c.lat]);
          }}
        >
          {t("addCentre")}
        </button>
        <button
          type="button"
          className="btn-secondary"
          disabled={corners.length === 0}
          onClick={() => {
            setCorners((old) => old.slice(0, -1));
            setFinished(false);
          }}
        >
          {t("undo")}
        </button>
        <button
          type="button"
          className="btn-secondary"
          disabled={corners.length === 0}
          onClick={() => {
            setCorners([]);
            setFinished(false);
            onChange(null);
          }}
        >
          {t("clear")}
        </button>
        <button
          type="button"
          className="btn-primary"
          disabled={corners.length < 3 || finished}
          onClick={() => {
            setFinished(true);
            onChange(polygonFromCorners(corners));
          }}
        >
          {t("finish")}
        </button>
      </div>
    </div>
  );
}

function DrawLayer({
  corners,
  finished,
  onAdd,
}: {
  corners: LonLat[];
  finished: boolean;
  onAdd: (c: LonLat) => void;
}) {
  const map = useMap();
  useMapEvents({ click: (e) => onAdd([e.latlng.lng, e.latlng.lat]) });
  useEffect(() => {
    const group = L.layerGroup().addTo(map);
    const latlngs = corners.map(([lon, lat]) => L.latLng(lat, lon));
    const style = { color: "#143a1c", weight: 3, fillColor: "#3d8a4a", fillOpacity: 0.2, interactive: false };
    if (finished && latlngs.length >= 3) L.polygon(latlngs, style).addTo(group);
    else if (latlngs.length >= 2) L.polyline(latlngs, { ...style, dashArray: "6 4" }).addTo(group);
    for (const ll of latlngs) {
      L.circleMarker(ll, {
        radius: 5,
        color: "#143a1c",
        weight: 2,
        fillColor: "#ffffff",
        fillOpacity: 1,
        interactive: false,
      }).addTo(group);
    }
    return () => {
      group.remove();
    };
  }, [map, corners, finished]);
  return null;
}
