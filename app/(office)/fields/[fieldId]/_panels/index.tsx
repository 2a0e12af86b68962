import { getTranslations } from "next-intl/server";
import { findAccountAccess } from "@/db/queries/access";
import { listFieldDigRootIndices, listFieldPlantingDates } from "@/db/queries/field-agronomy";
import { findField } from "@/db/queries/fields";
import { findStationWeather } from "@/db/queries/weather";
import { can } from "@/lib/auth/permissions";
import { requirePageUser } from "@/lib/auth/session";
import { DigsPanel } from "./digs-panel";
import { GddPanel } from "./gdd-panel";
import { gddPanelData } from "./gdd-data";
import { compareHybrids } from "./hybrid-stats";
import { HybridStatsPanel } from "./hybrid-stats-panel";
import { WeatherUpload } from "./weather-upload";

// The field page's agronomy panels: daily temperatures (CSV import), the GDD curve with the predicted
// stage and the V1–V6 dig window, digs over time with the root index by hybrid, and the hybrid
// comparison of a plot with replicated strips.
export async function FieldAgronomyPanels({ fieldId, canEdit }: { fieldId: string; canEdit: boolean }) {
  const user = await requirePageUser();
  const field = await findField(fieldId);
  const access = field && (await findAccountAccess(user, field.accountId));
  if (!field || !access || !can(user, "read", { kind: "field", access })) return null;
  const t = await getTranslations("fieldPage.panels");
  const [plantings, station, digs] = await Promise.all([
    listFieldPlantingDates(field.id),
    field.weatherStationId ? findStationWeather(field.weatherStationId) : Promise.resolve(undefined),
    listFieldDigRootIndices(field.id),
  ]);
  const records = station?.records ?? [];
  // The server's calendar day (UTC), as elsewhere on the server.
  const today = new Date().toISOString().slice(0, 10);
  const gdd = gddPanelData(field, plantings, records, today);
  const ids = {
    weather: `panel-weather-${field.id}`,
    gdd: `panel-gdd-${field.id}`,
    digs: `panel-digs-${field.id}`,
    stats: `panel-stats-${field.id}`,
  };

  return (
    <div className="space-y-6">
      <section aria-labelledby={ids.weather} className="card">
        <h2 id={ids.weather} className="text-xl font-bold">
          {t("weather.heading")}
        </h2>
        <p className="mt-2">
          {station
            ? t("weather.station", {
                station: station.name,
                days: records.length,
                first: records[0]?.date ?? "—",
                last: records.at(-1)?.date ?? "—",
              })
            : t("weather.noStation")}
        </p>
        {station && station.fieldCount > 1 ? (
          <p className="mt-1 text-sm text-soil-700">{t("weather.shared", { count: station.fieldCount })}</p>
        ) : null}
        {canEdit ? <WeatherUpload fieldId={field.id} /> : null}
      </section>
      <section aria-labelledby={ids.gdd} className="card">
        <h2 id={ids.gdd} className="text-xl font-bold">
          {t("gdd.heading")}
        </h2>
        <GddPanel data={gdd} headingId={ids.gdd} />
      </section>
      <section aria-labelledby={ids.digs} className="card">
        <h2 id={ids.digs} className="text-xl font-bold">
          {t("digs.heading")}
        </h2>
        <DigsPanel digs={digs} headingId={ids.digs} />
      </section>
      <section aria-labelledby={ids.stats} className="card">
        <h2 id={ids.stats} className="text-xl font-bold">
          {t("stats.heading")}
        </h2>
        <HybridStatsPanel comparison={compareHybrids(digs)} />
      </section>
    </div>
  );
}
