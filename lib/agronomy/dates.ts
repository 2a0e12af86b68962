import { argumentError } from "./validate";

const MS_PER_DAY = 86_400_000;

/**
 * Day number (days since 1970-01-01) of an ISO calendar date 'YYYY-MM-DD'. Calendar dates only, no
 * time zone: a field's day is the day written on the record, wherever the code runs.
 */
export function isoDateToDay(name: string, iso: string): number {
  const match = typeof iso === "string" ? /^(\d{4})-(\d{2})-(\d{2})$/.exec(iso) : null;
  if (match?.[1] === undefined || match[2] === undefined || match[3] === undefined) {
    throw argumentError(name, "an ISO date 'YYYY-MM-DD'", iso);
  }
  const year = Number(match[1]);
  const month = Number(match[2]);
  const day = Number(match[3]);
  const ms = Date.UTC(year, month - 1, day);
  const back = new Date(ms);
  if (back.getUTCFullYear() !== year || back.getUTCMonth() !== month - 1 || back.getUTCDate() !== day) {
    throw argumentError(name, "a real calendar date 'YYYY-MM-DD'", iso);
  }
  return Math.round(ms / MS_PER_DAY);
}

/** ISO date 'YYYY-MM-DD' of a day number. */
export function dayToIsoDate(day: number): string {
  return new Date(day * MS_PER_DAY).toISOString().slice(0, 10);
}

/** The ISO date `days` days after `iso` (negative goes back). */
export function addDays(iso: string, days: number): string {
  return dayToIsoDate(isoDateToDay("date", iso) + days);
}
