import { accumulateGdd, type DailyTemperature, type DigWindow, digWindow, stageOnDate } from "@/lib/agronomy";
import type { PulledAccount, PulledWeatherDay } from "@/sync/protocol";
import type { FieldDatabase, LocalField, LocalPlanting } from "@/sync/client/db";

// Days of the latest weather averaged into the daily GDD used past the last record.
const PROJECTION_DAYS = 14;

export type OutlookStatus =
  | { kind: "stage"; window: DigWindow; plantedOn: string; weatherEndsOn: string; projected: boolean }
  | { kind: "noPlanting" }
  | { kind: "notPlantedYet"; plantedOn: string }
  | { kind: "noWeather" }
  | { kind: "error"; message: string };

export interface FieldOutlook {
  field: LocalField;
  accountName: string | null;
  hybrids: string[];
  status: OutlookStatus;
}

/**
 * Mean daily GDD (°F-GDD/day) of the last PROJECTION_DAYS records: the stand-in for days after the
 * weather on this phone ends, so a stage is still shown (and marked projected) when the rep has not
 * synced for a while.
 */
export function recentDailyGdd(records: readonly DailyTemperature[]): number | undefined {
  const recent = accumulateGdd(records).slice(-PROJECTION_DAYS);
  if (recent.length === 0) return undefined;
  return recent.reduce((sum, d) => sum + d.gddF, 0) / recent.length;
}

/**
 * Where one field stands today: the latest planting on or before `today` (strips planted the same day
 * share a stage), its predicted leaf stage from the station's daily temperatures and the V1–V6 window.
 * @param today ISO date on the phone
 */
export function fieldOutlook(
  field: LocalField,
  plantings: readonly LocalPlanting[],
  weather: readonly PulledWeatherDay[],
  today: string,
  accountName: string | null,
): FieldOutlook {
  const sorted = [...plantings].sort((a, b) => b.plantedOn.localeCompare(a.plantedOn));
  const current = sorted.find((p) => p.plantedOn <= today);
  const base = { field, accountName };
  if (!current) {
    const next = sorted.at(-1);
    const status: OutlookStatus = next
      ? { kind: "notPlantedYet", plantedOn: next.plantedOn }
      : { kind: "noPlanting" };
    return { ...base, hybrids: [...new Set(sorted.map((p) => p.hybrid))], status };
  }
  const hybrids = [...new Set(sorted.filter((p) => p.plantedOn === current.plantedOn).map((p) => p.hybrid))];
  const records = weather.map((w) => ({ date: w.day, maxF: w.maxF, minF: w.minF }));
  if (records.length === 0) return { ...base, hybrids, status: { kind: "noWeather" } };
  try {
    const normalGddPerDay = recentDailyGdd(records);
    const window = digWindow({
      records,
      plantingDate: current.plantedOn,
      date: today,
      firstIrrigationDate: field.firstIrrigationOn,
      normalGddPerDay,
    });
    // Today's stage alone decides the mark; a projected opening or closing date is said "about".
    const { projected } = stageOnDate(records, current.plantedOn, today, { normalGddPerDay });
    const weatherEndsOn = records
      .map((r) => r.date)
      .sort()
      .at(-1)!;
    return {
      ...base,
      hybrids,
      status: {
        kind: "stage",
        window,
        plantedOn: current.plantedOn,
        weatherEndsOn,
        projected,
      },
    };
  } catch (err) {
    // Bad weather rows are the data's problem, not the phone's: show why for this field only.
    return {
      ...base,
      hybrids,
      status: { kind: "error", message: err instanceof Error ? err.message : String(err) },
    };
  }
}

function rank(o: FieldOutlook): number {
  if (o.status.kind !== "stage") return 4;
  const w = o.status.window;
  if (w.digNow) return 0;
  if (w.position === "in") return 1;
  return w.position === "before" ? 2 : 3;
}

/** Fields to dig now first, then in the window but irrigated, before it, past it, and unknown. */
export function sortOutlooks(outlooks: FieldOutlook[]): FieldOutlook[] {
  return [...outlooks].sort((a, b) => rank(a) - rank(b) || a.field.name.localeCompare(b.field.name));
}

// Map.groupBy is too new for some phones still in the field.
function groupBy<T>(rows: readonly T[], key: (row: T) => string): Map<string, T[]> {
  const out = new Map<string, T[]>();
  for (const row of rows) {
    const k = key(row);
    const list = out.get(k);
    if (list) list.push(row);
    else out.set(k, [row]);
  }
  return out;
}

/** Every field on this phone with its outlook for `today`, read in one transaction. */
export async function loadFieldOutlooks(db: FieldDatabase, today: string): Promise<FieldOutlook[]> {
  const { fields, accounts, plantings, weather } = await db.transaction(
    "r",
    [db.fields, db.accounts, db.plantings, db.weather],
    async () => ({
      fields: await db.fields.toArray(),
      accounts: await db.accounts.toArray(),
      plantings: await db.plantings.toArray(),
      weather: await db.weather.toArray(),
    }),
  );
  const accountNames = new Map(accounts.map((a: PulledAccount) => [a.id, a.name]));
  const byStation = groupBy(weather, (w) => w.stationId);
  const byField = groupBy(plantings, (p) => p.fieldId);
  return sortOutlooks(
    fields.map((f) =>
      fieldOutlook(
        f,
        byField.get(f.id) ?? [],
        f.weatherStationId ? (byStation.get(f.weatherStationId) ?? []) : [],
        today,
        accountNames.get(f.accountId) ?? null,
      ),
    ),
  );
}
