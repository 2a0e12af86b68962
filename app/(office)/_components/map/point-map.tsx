"use client";

import L from "leaflet";
import { useTranslations } from "next-intl";
import { useEffect } from "react";
import { MapContainer, useMap } from "react-leaflet";
import type { PolygonGeometry } from "@/lib/geo/map-features";
import { MapBase, type TileProps } from "./map-base";
import { POINT_SVG } from "./pin-icons";

export interface PointMapProps extends TileProps {
  latitude: number;
  longitude: number;
  /** The field's boundary, drawn under the point. */
  boundary?: PolygonGeometry | null;
  /** CSS height; default 16rem. */
  height?: string;
}

/** A small map of one place (a dig, a case) with the field around it. */
export function PointMap({
  latitude,
  longitude,
  boundary,
  height = "16rem",
  tileUrl,
  tileAttribution,
}: PointMapProps) {
  const t = useTranslations("map.point");
  return (
    <div className="overflow-hidden rounded-card border border-soil-300" style={{ height }}>
      <MapContainer
        className="trench-map h-full w-full"
        center={[latitude, longitude]}
        zoom={16}
        minZoom={3}
        maxZoom={19}
        scrollWheelZoom={false}
      >
        <MapBase
          tileUrl={tileUrl}
          tileAttribution={tileAttribution}
          label={t("label", { latitude: latitude.toFixed(5), longitude: longitude.toFixed(5) })}
        />
        <PointLayers
          latitude={latitude}
          longitude={longitude}
          boundary={boundary ?? null}
          label={t("marker")}
        />
      </MapContainer>
    </div>
  );
}

function PointLayers({
  latitude,
  longitude,
  boundary,
  label,
}: {
  latitude: number;
  longitude: number;
  boundary: PolygonGeometry | null;
  label: string;
}) {
  const map = useMap();
  useEffect(() => {
    const group = L.featureGroup().addTo(map);
    if (boundary) {
      L.geoJSON(boundary as GeoJSON.Polygon, {
        style: { color: "#5a4529", weight: 2, fillColor: "#c9b493", fillOpacity: 0.18 },
        interactive: false,
      }).addTo(group);
    }
    const marker = L.marker([latitude, longitude], {
      icon: L.divIcon({
        html: POINT_SVG,
        className: "trench-point",
        iconSize: [30, 30],
        iconAnchor: [15, 15],
      }),
      title: label,
      keyboard: false,
      interactive: false,
    }).addTo(group);
    marker.getElement()?.setAttribute("aria-hidden", "true");
    const bounds = group.getBounds();
    if (boundary && bounds.isValid())
      map.fitBounds(bounds, { padding: [16, 16], maxZoom: 17, animate: false });
    else map.setView([latitude, longitude], 16, { animate: false });
    return () => {
      group.remove();
    };
  }, [map, latitude, longitude, boundary, label]);
  return null;
}
