import "server-only";
import type { Kysely } from "kysely";
import { addDays, type DailyTemperature, isoDateToDay } from "@/lib/agronomy";
import type { Database } from "../schema";
import { createRandom, demoId, round, SEED_VERSION } from "./ids";

export const DEMO_STATION = {
  name: "Sandhollow Valley floor station",
  latitude: 36.8795,
  longitude: -120.3172,
};
export const WEATHER_FIRST_DAY = "2026-03-15";
export const WEATHER_LAST_DAY = "2026-07-31";

/**
 * An invented season of daily air temperatures (°F) for a hot irrigated valley: a smooth seasonal
 * curve (max about 69 °F in mid-March to 97 °F at the end of July, min about 42 to 63 °F), weather
 * fronts as a slowly decaying random swing shared by max and min, and a little day-to-day noise. The
 * minimum always stays at least 12 °F under the maximum (a dry valley's day–night range is wide).
 */
export function demoWeather(): DailyTemperature[] {
  const random = createRandom(20260315);
  const first = isoDateToDay("first", WEATHER_FIRST_DAY);
  const last = isoDateToDay("last", WEATHER_LAST_DAY);
  const jan1 = isoDateToDay("jan1", "2026-01-01");
  const records: DailyTemperature[] = [];
  let front = 0;
  for (let day = first; day <= last; day++) {
    const doy = day - jan1 + 1;
    front = 0.75 * front + 2.6 * random.normal();
    const seasonMax = 79 + 18 * Math.cos((2 * Math.PI * (doy - 200)) / 365);
    const seasonMin = 50 + 13 * Math.cos((2 * Math.PI * (doy - 205)) / 365);
    const maxF = round(seasonMax + front + 1.8 * random.normal(), 1);
    const minF = round(Math.min(seasonMin + 0.6 * front + 1.4 * random.normal(), maxF - 12), 1);
    records.push({ date: addDays(WEATHER_FIRST_DAY, day - first), maxF, minF });
  }
  return records;
}

/** Inserts the demo station and its season; returns the station id and the records. */
export async function seedWeather(
  db: Kysely<Database>,
  regionId: string,
): Promise<{ stationId: string; records: DailyTemperature[] }> {
  const stationId = demoId("weather_station", DEMO_STATION.name);
  await db
    .insertInto("weatherStation")
    .values({ id: stationId, regionId, ...DEMO_STATION })
    .execute();
  const records = demoWeather();
  await db
    .insertInto("weatherDaily")
    .values(
      records.map((r) => ({
        stationId,
        day: r.date,
        maxF: r.maxF,
        minF: r.minF,
        source: "demo",
        version: SEED_VERSION,
      })),
    )
    .execute();
  return { stationId, records };
}
