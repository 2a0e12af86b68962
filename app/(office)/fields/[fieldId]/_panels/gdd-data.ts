import {
  addDays,
  type DailyTemperature,
  type DigWindow,
  gddForLeafStage,
  isoDateToDay,
  ROOT_DIG_WINDOW,
} from "@/lib/agronomy";
import { fieldOutlook, recentDailyGdd } from "@/app/(field)/field/_components/field-outlook";
import type { LocalField } from "@/sync/client/db";
import { type GddCurvePoint, gddCurve } from "@/lib/weather/gdd-curve";

// Days the chart runs on past the later of today and the window's close, so the close shows.
const TAIL_DAYS = 7;
// The longest season the chart draws, days from the first planting.
const MAX_DAYS = 180;

export interface GddSeries {
  plantedOn: string;
  hybrids: string[];
  points: GddCurvePoint[];
  /** The planting Today's stage is for (the latest on or before today). */
  current: boolean;
}

export type GddPanelData =
  | { kind: "noPlanting" }
  | { kind: "notPlantedYet"; plantedOn: string }
  | { kind: "noWeather" }
  | { kind: "error"; message: string }
  | {
      kind: "curve";
      series: GddSeries[];
      window: DigWindow;
      /** True when today's stage used projected days (as Today marks it). */
      todayProjected: boolean;
      plantedOn: string;
      today: string;
      weatherEndsOn: string;
      /** Normal daily GDD used past the last record, °F-GDD/day. */
      normalGddPerDay: number | undefined;
      /** GDD since planting at V1 and at V7 (the window is V1 through the day before V7), °F-GDD. */
      v1GddF: number;
      v7GddF: number;
      end: string;
    };

export interface FieldForGdd {
  id: string;
  accountId: string;
  name: string;
  firstIrrigationOn: string | null;
  weatherStationId: string | null;
}

/**
 * The GDD panel's figures, worked out exactly as the field app's Today screen does (fieldOutlook:
 * the latest planting on or before today, the station's days, the mean of the last two weeks past
 * the last record), plus one cumulative curve per planting date.
 */
export function gddPanelData(
  field: FieldForGdd,
  plantings: readonly { id: string; hybrid: string; plantedOn: string }[],
  records: readonly DailyTemperature[],
  today: string,
): GddPanelData {
  const local = {
    id: field.id,
    accountId: field.accountId,
    name: field.name,
    boundary: null,
    areaAcres: null,
    centroidLat: null,
    centroidLon: null,
    irrigation: "none",
    soilTexture: "medium",
    weatherStationId: field.weatherStationId,
    firstIrrigationOn: field.firstIrrigationOn,
    version: 0,
  } satisfies LocalField;
  const localPlantings = plantings.map((p) => ({
    id: p.id,
    fieldId: field.id,
    accountId: field.accountId,
    hybrid: p.hybrid,
    plantedOn: p.plantedOn,
    seedingRate: 0,
    seedingDepthIn: 0,
    rowSpacingIn: 0,
    soilTexture: "medium" as const,
    version: 0,
  }));
  const weather = records.map((r) => ({
    stationId: field.weatherStationId ?? "",
    day: r.date,
    maxF: r.maxF,
    minF: r.minF,
  }));
  const { status } = fieldOutlook(local, localPlantings, weather, today, null);
  if (status.kind !== "stage") return status;
  try {
    const normalGddPerDay = recentDailyGdd(records);
    const byDate = new Map<string, string[]>();
    for (const p of plantings) {
      if (p.plantedOn > today) continue;
      byDate.set(p.plantedOn, [...(byDate.get(p.plantedOn) ?? []), p.hybrid]);
    }
    const dates = [...byDate.keys()].sort();
    const first = dates[0] ?? status.plantedOn;
    const closes = status.window.closesOn?.date ?? today;
    const wanted = addDays([today, closes, status.weatherEndsOn].sort().at(-1) ?? today, TAIL_DAYS);
    const cap = addDays(first, MAX_DAYS);
    const end = isoDateToDay("end", wanted) > isoDateToDay("cap", cap) ? cap : wanted;
    const series = dates.map((plantedOn) => ({
      plantedOn,
      hybrids: [...new Set(byDate.get(plantedOn))].sort(),
      points: gddCurve(records, plantedOn, end, normalGddPerDay),
      current: plantedOn === status.plantedOn,
    }));
    return {
      kind: "curve",
      series,
      window: status.window,
      todayProjected: status.projected,
      plantedOn: status.plantedOn,
      today,
      weatherEndsOn: status.weatherEndsOn,
      normalGddPerDay,
      v1GddF: gddForLeafStage(`V${ROOT_DIG_WINDOW.firstCollars}`),
      v7GddF: gddForLeafStage(`V${ROOT_DIG_WINDOW.lastCollars + 1}`),
      end,
    };
  } catch (err) {
    return { kind: "error", message: err instanceof Error ? err.message : String(err) };
  }
}
