import { addDays, type DailyTemperature, isoDateToDay } from "@/lib/agronomy";
import { checkNormalGdd, indexDailyGdd } from "@/lib/agronomy/gdd";

export interface GddCurvePoint {
  date: string;
  /** GDD since planting through this day, °F-GDD: equal to lib/agronomy gddSincePlanting on that day. */
  cumulativeGddF: number;
  /** True for a day after the last weather record: its GDD is the normal, a projection. */
  projected: boolean;
}

/**
 * The cumulative GDD (°F) curve of one planting, one point per day from the planting date through
 * `through`, by the same rules as lib/agronomy gddSincePlanting (the planting day counts 0; each
 * recorded day its 86/50 °F GDD; a day without a record `normalGddPerDay`, or 0 without one), so the
 * curve on any day equals the figure the stage is predicted from. Points after the last record are
 * marked projected; without a normal the curve stops at the last record. Empty when `through` is
 * before planting.
 * @param plantingDate ISO date
 * @param through ISO date, the last day of the curve
 * @param normalGddPerDay °F-GDD per day used for days without a record
 */
export function gddCurve(
  records: readonly DailyTemperature[],
  plantingDate: string,
  through: string,
  normalGddPerDay?: number,
): GddCurvePoint[] {
  const start = isoDateToDay("plantingDate", plantingDate);
  const end = isoDateToDay("through", through);
  const normal = checkNormalGdd(normalGddPerDay);
  const { byDay, lastDay } = indexDailyGdd(records);
  const points: GddCurvePoint[] = [];
  let total = 0;
  for (let day = start; day <= end; day++) {
    const projected = lastDay === null || day > lastDay;
    if (projected && normal === undefined) break;
    if (day > start) total += byDay.get(day) ?? normal ?? 0;
    points.push({ date: addDays(plantingDate, day - start), cumulativeGddF: total, projected });
  }
  return points;
}
