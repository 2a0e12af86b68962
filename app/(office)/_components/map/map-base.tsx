"use client";

import "leaflet/dist/leaflet.css";
import { useEffect } from "react";
import { ScaleControl, TileLayer, useMap } from "react-leaflet";

export interface TileProps {
  /** A tile URL template ({z}/{x}/{y}); with none the map draws on a plain background. */
  tileUrl?: string;
  tileAttribution?: string;
}

// The plain background is styled on the container (.trench-map in each map): no tile server needed.
export const MAP_BACKGROUND = "#f4f1ea";

/** Scale bar, the optional tile layer, and an accessible name on the focusable map container. */
export function MapBase({ tileUrl, tileAttribution, label }: TileProps & { label: string }) {
  const map = useMap();
  useEffect(() => {
    const el = map.getContainer();
    el.setAttribute("aria-label", label);
    el.setAttribute("role", "region");
    el.setAttribute("aria-roledescription", "map");
    el.style.background = MAP_BACKGROUND;
  }, [map, label]);
  return (
    <>
      {tileUrl ? <TileLayer url={tileUrl} attribution={tileAttribution ?? ""} maxZoom={19} /> : null}
      <ScaleControl position="bottomleft" imperial metric />
    </>
  );
}
