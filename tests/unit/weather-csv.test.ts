import { describe, expect, it } from "vitest";
import { celsiusToFahrenheit, MAX_CSV_DAYS, parseWeatherCsv } from "@/lib/weather/csv";

// Row numbers are the file's lines, header = row 1.

function messages(text: string, unit?: "F" | "C"): string[] {
  const result = parseWeatherCsv(text, unit);
  if (result.ok) throw new Error("expected errors");
  return result.errors.map((e) => e.message);
}

describe("parseWeatherCsv", () => {
  it("reads a good file with date,max,min in °F, rows numbered from the header line", () => {
    const result = parseWeatherCsv("date,max,min\n2026-05-01,78,51\n2026-05-02,81.5,54\n");
    expect(result).toEqual({
      ok: true,
      unit: "F",
      rows: [
        { row: 2, date: "2026-05-01", maxF: 78, minF: 51 },
        { row: 3, date: "2026-05-02", maxF: 81.5, minF: 54 },
      ],
    });
  });

  it("accepts max_f,min_f headers in any order and case, CRLF line ends, a BOM and blank lines", () => {
    const result = parseWeatherCsv("\uFEFFMin_F,Date,Max_F\r\n50,2026-05-01,70\r\n\r\n52,2026-05-03,74\r\n");
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.rows).toEqual([
      { row: 2, date: "2026-05-01", maxF: 70, minF: 50 },
      { row: 4, date: "2026-05-03", maxF: 74, minF: 52 },
    ]);
  });

  it("converts °C to °F (°F = °C × 1.8 + 32, the definition of the scales) from the selector or the headers", () => {
    expect(celsiusToFahrenheit(30)).toBe(86);
    expect(celsiusToFahrenheit(10)).toBe(50);
    const selected = parseWeatherCsv("date,max,min\n2026-05-01,30,10\n", "C");
    expect(selected).toMatchObject({ ok: true, unit: "C", rows: [{ maxF: 86, minF: 50 }] });
    const named = parseWeatherCsv("date,max_c,min_c\n2026-05-01,25,15\n");
    expect(named).toMatchObject({ ok: true, unit: "C", rows: [{ maxF: 77, minF: 59 }] });
  });

  it("names the row of a max below its min", () => {
    const text = [
      "date,max,min",
      ...Array.from({ length: 5 }, (_, i) => `2026-05-0${i + 1},70,50`),
      "2026-05-06,45,52",
    ];
    expect(messages(text.join("\n"))).toEqual(["Row 7: max 45 is below min 52"]);
  });

  it("names impossible calendar dates and dates in another form", () => {
    expect(messages("date,max,min\n2026-02-28,60,40\n2026-02-30,61,41\n05/01/2026,62,42\n")).toEqual([
      "Row 3: date 2026-02-30 is not a date",
      "Row 4: date 05/01/2026 is not a date in the form YYYY-MM-DD",
    ]);
  });

  it("names a duplicate date and the row it first appeared on", () => {
    expect(messages("date,max,min\n2026-05-01,70,50\n2026-05-02,71,51\n2026-05-01,72,52\n")).toEqual([
      "Row 4: date 2026-05-01 is already on row 2",
    ]);
  });

  it("refuses temperatures outside −60…130 °F and says so in the file's unit", () => {
    expect(messages("date,max,min\n2026-05-01,131,50\n2026-05-02,70,-61\n2026-05-03,130,-60\n")).toEqual([
      "Row 2: max 131 is outside the plausible range -60 to 130 °F",
      "Row 3: min -61 is outside the plausible range -60 to 130 °F",
    ]);
    // 130 °F = 54.4 °C and −60 °F = −51.1 °C (one decimal).
    expect(messages("date,max,min\n2026-05-01,60,10\n", "C")).toEqual([
      "Row 2: max 60 is outside the plausible range -51.1 to 54.4 °C",
    ]);
  });

  it("names values that are not numbers, missing values and rows of the wrong width", () => {
    expect(messages("date,max,min\n2026-05-01,warm,50\n2026-05-02,70,\n2026-05-03,70\n")).toEqual([
      "Row 2: max warm is not a number",
      "Row 3: min (empty) is not a number",
      "Row 4: expected 3 values (date, max, min), found 2",
    ]);
  });

  it("lists every error of the file, not only the first", () => {
    const errors = parseWeatherCsv("date,max,min\n2026-13-01,70,50\n2026-05-02,40,50\n2026-05-03,x,200\n");
    expect(errors.ok).toBe(false);
    if (errors.ok) return;
    expect(errors.errors.map((e) => [e.row, e.code])).toEqual([
      [2, "dateInvalid"],
      [3, "maxBelowMin"],
      [4, "notNumber"],
      [4, "outOfRange"],
    ]);
  });

  it("refuses a file without the three columns, an empty file and one with only a header", () => {
    expect(messages("when,high,low\n2026-05-01,70,50\n")).toEqual([
      "Row 1: the header must name the columns date, max and min (found: when, high, low)",
    ]);
    expect(messages("")).toEqual(["The file has no rows of data."]);
    expect(messages("date,max,min\n\n")).toEqual(["The file has no rows of data."]);
  });

  it(`refuses more than ${MAX_CSV_DAYS} days in one file`, () => {
    const lines = Array.from({ length: MAX_CSV_DAYS + 1 }, () => "2026-05-01,70,50");
    expect(messages(`date,max,min\n${lines.join("\n")}`)).toEqual([
      `The file has ${MAX_CSV_DAYS + 1} rows of data; at most ${MAX_CSV_DAYS} days can be imported at once.`,
    ]);
  });
});
