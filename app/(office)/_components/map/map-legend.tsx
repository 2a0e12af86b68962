"use client";

import { useTranslations } from "next-intl";
import type { IndexBand } from "@/lib/geo/map-features";
import { clusterSvg, pinSvg } from "./pin-icons";

const BANDS: IndexBand[] = ["good", "fair", "poor", "unscored"];

// The key to the pins as text beside the map (the drawings repeat the words, they never replace them).
export function MapLegend() {
  const t = useTranslations("map.legend");
  const icon = (svg: string) => (
    // biome-ignore lint/security/noDangerouslySetInnerHtml: our own static SVG markup
    <span className="inline-flex w-12 shrink-0 justify-center" dangerouslySetInnerHTML={{ __html: svg }} />
  );
  return (
    <section aria-labelledby="map-legend-heading" className="card h-fit space-y-2 text-sm">
      <h2 id="map-legend-heading" className="text-base font-semibold">
        {t("heading")}
      </h2>
      <p>{t("intro")}</p>
      <ul className="space-y-2">
        {BANDS.map((b) => (
          <li key={b} className="flex items-center gap-2">
            {icon(pinSvg(b, false))}
            <span>{t(b)}</span>
          </li>
        ))}
        <li className="flex items-center gap-2">
          {icon(pinSvg("good", true))}
          <span>{t("flagged")}</span>
        </li>
        <li className="flex items-center gap-2">
          {icon(clusterSvg(12, 1).html)}
          <span>{t("cluster")}</span>
        </li>
        <li className="flex items-center gap-2">
          <span className="inline-flex w-12 shrink-0 justify-center" aria-hidden="true">
            <span className="block h-5 w-8 border-2 border-soil-700 bg-soil-300/40" />
          </span>
          <span>{t("field")}</span>
        </li>
      </ul>
    </section>
  );
}
