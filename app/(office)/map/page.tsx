import type { Metadata } from "next";
import { getTranslations } from "next-intl/server";
import { listMapAccounts } from "@/db/queries/map";
import { requirePageUser } from "@/lib/auth/session";
import { env } from "@/lib/env";
import { DigMap } from "../_components/map";

export const metadata: Metadata = { title: "Field map" };

// Every signed-in role: the map API scopes every row, so a grower sees only their own farm.
export default async function MapPage() {
  const user = await requirePageUser();
  const t = await getTranslations("map.page");
  const accounts = await listMapAccounts(user);
  return (
    <section aria-labelledby="map-heading" className="space-y-4">
      <h1 id="map-heading">{t("heading")}</h1>
      <p className="text-soil-700">{user.role === "grower" ? t("growerIntro") : t("intro")}</p>
      <DigMap
        showFilters
        height="34rem"
        accounts={accounts}
        tileUrl={env.MAP_TILE_URL}
        tileAttribution={env.MAP_TILE_ATTRIBUTION}
      />
      <p className="notice-caution text-sm">{t("caution")}</p>
    </section>
  );
}
