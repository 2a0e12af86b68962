import Papa from "papaparse";
import { isoDateToDay } from "@/lib/agronomy";

// Daily temperatures from a CSV file: a header line naming the columns date, max and min (°F; also
// max_f/min_f, or max_c/min_c for °C), then one line per day. Pure: returns every row or every
// row-level error, never a partial result, so a file with any error imports nothing.
//
// Row numbers are the file's line numbers counted from 1, the header being row 1 (so the first day
// is row 2), as a spreadsheet shows them. Blank lines count but are skipped.

export type CsvUnit = "F" | "C";

/** Plausible daily air temperatures, °F: outside this a value is a typing or unit mistake. */
export const PLAUSIBLE_F = { min: -60, max: 130 } as const;
/** Most days one file may hold (ten years). */
export const MAX_CSV_DAYS = 3660;

export interface WeatherCsvRow {
  /** Line of the file, header = 1. */
  row: number;
  date: string;
  maxF: number;
  minF: number;
}

export type WeatherCsvErrorCode =
  | "empty"
  | "header"
  | "tooManyRows"
  | "columns"
  | "dateFormat"
  | "dateInvalid"
  | "duplicate"
  | "notNumber"
  | "outOfRange"
  | "maxBelowMin";

export interface WeatherCsvError {
  /** Line of the file, header = 1; 0 for an error about the whole file. */
  row: number;
  code: WeatherCsvErrorCode;
  /** Values for the message, as written in the file (temperatures in the file's unit). */
  params: Record<string, string | number>;
  /** The message in English, e.g. "Row 7: max 45 is below min 52". */
  message: string;
}

export type WeatherCsvResult =
  | { ok: true; rows: WeatherCsvRow[]; unit: CsvUnit }
  | { ok: false; errors: WeatherCsvError[] };

const DATE_HEADERS = ["date", "day"];
const MAX_HEADERS: Record<string, CsvUnit | null> = { max: null, max_f: "F", tmax: null, max_c: "C" };
const MIN_HEADERS: Record<string, CsvUnit | null> = { min: null, min_f: "F", tmin: null, min_c: "C" };

const fToText = (v: number) => `${v}`;

function englishMessage(row: number, code: WeatherCsvErrorCode, p: Record<string, string | number>): string {
  const at = row > 0 ? `Row ${row}: ` : "";
  switch (code) {
    case "empty":
      return "The file has no rows of data.";
    case "header":
      return `${at}the header must name the columns date, max and min (found: ${p.found})`;
    case "tooManyRows":
      return `The file has ${p.count} rows of data; at most ${p.max} days can be imported at once.`;
    case "columns":
      return `${at}expected 3 values (date, max, min), found ${p.found}`;
    case "dateFormat":
      return `${at}date ${p.value} is not a date in the form YYYY-MM-DD`;
    case "dateInvalid":
      return `${at}date ${p.value} is not a date`;
    case "duplicate":
      return `${at}date ${p.value} is already on row ${p.firstRow}`;
    case "notNumber":
      return `${at}${p.column} ${p.value} is not a number`;
    case "outOfRange":
      return `${at}${p.column} ${p.value} is outside the plausible range ${p.min} to ${p.max} °${p.unit}`;
    case "maxBelowMin":
      return `${at}max ${p.max} is below min ${p.min}`;
  }
}

function error(row: number, code: WeatherCsvErrorCode, params: Record<string, string | number> = {}) {
  return { row, code, params, message: englishMessage(row, code, params) };
}

/** °C to °F. */
export function celsiusToFahrenheit(c: number): number {
  return c * 1.8 + 32;
}

const round1 = (v: number) => Math.round(v * 10) / 10;

/**
 * Parses a daily-temperature CSV. `unit` is the unit of plain max/min columns (default °F); columns
 * named max_f/min_f or max_c/min_c say their own unit. Temperatures come back in °F.
 */
export function parseWeatherCsv(text: string, unit: CsvUnit = "F"): WeatherCsvResult {
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ""), {
    header: false,
    skipEmptyLines: false,
    delimiter: ",",
  });
  const lines = parsed.data;
  const isBlank = (cells: string[]) => cells.every((c) => c.trim() === "");
  const headerIndex = lines.findIndex((cells) => !isBlank(cells));
  if (headerIndex < 0) return { ok: false, errors: [error(0, "empty")] };

  const header = (lines[headerIndex] ?? []).map((c) => c.trim().toLowerCase());
  const headerRow = headerIndex + 1;
  const dateCol = header.findIndex((h) => DATE_HEADERS.includes(h));
  const maxCol = header.findIndex((h) => h in MAX_HEADERS);
  const minCol = header.findIndex((h) => h in MIN_HEADERS);
  if (dateCol < 0 || maxCol < 0 || minCol < 0) {
    return { ok: false, errors: [error(headerRow, "header", { found: header.join(", ") || "nothing" })] };
  }
  const fileUnit = MAX_HEADERS[header[maxCol] ?? ""] ?? MIN_HEADERS[header[minCol] ?? ""] ?? unit;
  const toF = (v: number) => (fileUnit === "C" ? round1(celsiusToFahrenheit(v)) : v);
  const plausible =
    fileUnit === "C"
      ? { min: round1((PLAUSIBLE_F.min - 32) / 1.8), max: round1((PLAUSIBLE_F.max - 32) / 1.8) }
      : PLAUSIBLE_F;

  const dataLines = lines
    .map((cells, i) => ({ cells, row: i + 1 }))
    .slice(headerIndex + 1)
    .filter(({ cells }) => !isBlank(cells));
  if (dataLines.length === 0) return { ok: false, errors: [error(0, "empty")] };
  if (dataLines.length > MAX_CSV_DAYS) {
    return { ok: false, errors: [error(0, "tooManyRows", { count: dataLines.length, max: MAX_CSV_DAYS })] };
  }

  const errors: WeatherCsvError[] = [];
  const rows: WeatherCsvRow[] = [];
  const firstRowOfDate = new Map<string, number>();
  const width = header.length;
  for (const { cells, row } of dataLines) {
    if (cells.length !== width) {
      errors.push(error(row, "columns", { found: cells.length }));
      continue;
    }
    const date = (cells[dateCol] ?? "").trim();
    let dateOk = false;
    if (!/^\d{4}-\d{2}-\d{2}$/.test(date)) {
      errors.push(error(row, "dateFormat", { value: date || "(empty)" }));
    } else {
      try {
        isoDateToDay("date", date);
        dateOk = true;
      } catch {
        errors.push(error(row, "dateInvalid", { value: date }));
      }
    }
    if (dateOk) {
      const first = firstRowOfDate.get(date);
      if (first !== undefined) {
        errors.push(error(row, "duplicate", { value: date, firstRow: first }));
        dateOk = false;
      } else {
        firstRowOfDate.set(date, row);
      }
    }
    const temperature = (column: "max" | "min", raw: string): number | null => {
      const text = raw.trim();
      const value = text === "" ? Number.NaN : Number(text);
      if (!Number.isFinite(value)) {
        errors.push(error(row, "notNumber", { column, value: text || "(empty)" }));
        return null;
      }
      if (value < plausible.min || value > plausible.max) {
        errors.push(
          error(row, "outOfRange", {
            column,
            value: fToText(value),
            min: plausible.min,
            max: plausible.max,
            unit: fileUnit,
          }),
        );
        return null;
      }
      return value;
    };
    const max = temperature("max", cells[maxCol] ?? "");
    const min = temperature("min", cells[minCol] ?? "");
    if (max !== null && min !== null && max < min) {
      errors.push(error(row, "maxBelowMin", { max: fToText(max), min: fToText(min) }));
      continue;
    }
    if (dateOk && max !== null && min !== null) rows.push({ row, date, maxF: toF(max), minF: toF(min) });
  }
  if (errors.length > 0) return { ok: false, errors };
  return { ok: true, rows, unit: fileUnit };
}
