import { dayToIsoDate, isoDateToDay } from "./dates";
import { argumentError, checkNumber, checkOneOf } from "./validate";

export type TemperatureUnit = "F" | "C";

// Corn GDD thresholds: base 50 °F, cap 86 °F; the °C form uses 10/30 (Nielsen, "Heat Unit Concepts
// Related to Corn Development", Purdue Extension, rev. 2020; AMS Glossary of Meteorology, "corn heat unit").
const THRESHOLDS: Record<TemperatureUnit, { base: number; cap: number; min: number; max: number }> = {
  F: { base: 50, cap: 86, min: -100, max: 150 },
  C: { base: 10, cap: 30, min: -75, max: 65 },
};

/** Largest daily GDD in °F: (86 + 86) / 2 − 50 = 36 (Iowa State University Agron 541, lesson 2b). */
export const MAX_DAILY_GDD_F = 36;

/**
 * Growing degree days for one day by the 86/50 °F method (or 30/10 °C with unit 'C', which returns
 * °C-GDD; one °C-GDD is 1.8 °F-GDD). Each of Tmax and Tmin is held between 50 and 86 °F before
 * averaging, so a day gives 0 to 36 °F-GDD (0 to 20 °C-GDD).
 * @param maxTemp daily maximum air temperature, °F (or °C)
 * @param minTemp daily minimum air temperature, °F (or °C); must not exceed maxTemp
 * @returns GDD for the day, °F-GDD (or °C-GDD)
 */
export function dailyGdd(maxTemp: number, minTemp: number, unit: TemperatureUnit = "F"): number {
  const t = THRESHOLDS[checkOneOf("unit", unit, ["F", "C"] as const)];
  const rule = { min: t.min, max: t.max, unit: `°${unit}` };
  checkNumber("maxTemp", maxTemp, rule);
  checkNumber("minTemp", minTemp, rule);
  if (minTemp > maxTemp) throw argumentError("minTemp", `at most maxTemp (${maxTemp} °${unit})`, minTemp);
  const clamp = (v: number) => Math.min(t.cap, Math.max(t.base, v));
  return (clamp(maxTemp) + clamp(minTemp)) / 2 - t.base;
}

/** One day of weather for a field: ISO date and the day's maximum and minimum air temperature, °F. */
export interface DailyTemperature {
  date: string;
  maxF: number;
  minF: number;
}

export interface DailyGdd {
  date: string;
  /** GDD for the day, °F-GDD. */
  gddF: number;
  /** GDD from the first record through this day, °F-GDD. */
  cumulativeGddF: number;
}

/**
 * Daily and running GDD (°F) from daily records, in date order (the input may be unsorted; two records
 * for the same date are a RangeError). Days missing between records are not filled in.
 */
export function accumulateGdd(records: readonly DailyTemperature[]): DailyGdd[] {
  const lookup = indexDailyGdd(records);
  let total = 0;
  return [...lookup.byDay.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([day, gddF]) => {
      total += gddF;
      return { date: dayToIsoDate(day), gddF, cumulativeGddF: total };
    });
}

/** Daily GDD (°F) keyed by day number, checked once. Used by the date-walking functions. */
export function indexDailyGdd(records: readonly DailyTemperature[]): {
  byDay: Map<number, number>;
  lastDay: number | null;
} {
  if (!Array.isArray(records)) throw argumentError("records", "an array of daily temperatures", records);
  const byDay = new Map<number, number>();
  let lastDay: number | null = null;
  records.forEach((r, i) => {
    const day = isoDateToDay(`records[${i}].date`, r.date);
    if (byDay.has(day)) throw argumentError(`records[${i}].date`, "a date not already in records", r.date);
    const rule = { min: THRESHOLDS.F.min, max: THRESHOLDS.F.max, unit: "°F" };
    checkNumber(`records[${i}].maxF`, r.maxF, rule);
    checkNumber(`records[${i}].minF`, r.minF, rule);
    if (r.minF > r.maxF) {
      throw argumentError(`records[${i}].minF`, `at most records[${i}].maxF (${r.maxF} °F)`, r.minF);
    }
    byDay.set(day, dailyGdd(r.maxF, r.minF, "F"));
    lastDay = lastDay === null ? day : Math.max(lastDay, day);
  });
  return { byDay, lastDay };
}

export interface ProjectionOptions {
  /**
   * Normal (long-term average) GDD per day, °F-GDD, used for days that have no record, such as
   * future days. Without it such days count 0 and the result says it is incomplete.
   */
  normalGddPerDay?: number;
}

export interface GddAccumulation {
  /** GDD from the day after planting through `onDate`, °F-GDD. */
  gddF: number;
  observedDays: number;
  /** Days filled with normalGddPerDay. */
  projectedDays: number;
  /** Days with neither a record nor a normal; they count 0. */
  missingDays: number;
  /** True when any day came from normalGddPerDay: the figure is a projection. */
  projected: boolean;
  /** True when no day was missing. */
  complete: boolean;
}

export function checkNormalGdd(normal: number | undefined): number | undefined {
  if (normal === undefined) return undefined;
  return checkNumber("normalGddPerDay", normal, { min: 0, max: MAX_DAILY_GDD_F, unit: "°F-GDD/day" });
}

/**
 * GDD (°F) accumulated since planting, on `onDate`. Our convention: the planting day itself counts 0
 * (the seed goes in part way through it); every day after it through `onDate` counts in full.
 * @param plantingDate ISO date
 * @param onDate ISO date, on or after plantingDate
 */
export function gddSincePlanting(
  records: readonly DailyTemperature[],
  plantingDate: string,
  onDate: string,
  options: ProjectionOptions = {},
): GddAccumulation {
  const start = isoDateToDay("plantingDate", plantingDate);
  const end = isoDateToDay("onDate", onDate);
  if (end < start) throw argumentError("onDate", `on or after plantingDate (${plantingDate})`, onDate);
  const normal = checkNormalGdd(options.normalGddPerDay);
  const { byDay } = indexDailyGdd(records);
  const result = { gddF: 0, observedDays: 0, projectedDays: 0, missingDays: 0 };
  for (let day = start + 1; day <= end; day++) {
    const observed = byDay.get(day);
    if (observed !== undefined) {
      result.gddF += observed;
      result.observedDays++;
    } else if (normal !== undefined) {
      result.gddF += normal;
      result.projectedDays++;
    } else {
      result.missingDays++;
    }
  }
  return { ...result, projected: result.projectedDays > 0, complete: result.missingDays === 0 };
}
