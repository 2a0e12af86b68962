import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  acresToHectares,
  celsiusToFahrenheit,
  cmToInches,
  convertForDisplay,
  fahrenheitToCelsius,
  feetToMeters,
  formatForDisplay,
  formatLength,
  galPerAcreToLPerHa,
  gddCelsiusToFahrenheit,
  gddFahrenheitToCelsius,
  hectaresToAcres,
  inchesToCm,
  kgPerHaToLbPerAcre,
  lbPerAcreToKgPerHa,
  lPerHaToGalPerAcre,
  metersToFeet,
  parseLengthInches,
  splitFeetInches,
} from "@/lib/agronomy";
import { SRC } from "./sources";

describe("conversions", () => {
  it(`in↔cm (2.54) and ft↔m (0.3048) — ${SRC.nist}`, () => {
    expect(inchesToCm(1)).toBeCloseTo(2.54, 12);
    expect(cmToInches(10)).toBeCloseTo(3.937007874, 8);
    expect(feetToMeters(17.42)).toBeCloseTo(5.309616, 6);
    expect(metersToFeet(1)).toBeCloseTo(3.280839895, 8);
  });

  it(`lb/acre × 1.12085 = kg/ha; 1 gal/acre = 9.35396 L/ha; 1 acre = 4046.8564224 m² — ${SRC.nist}`, () => {
    expect(lbPerAcreToKgPerHa(100)).toBeCloseTo(112.085, 6);
    expect(kgPerHaToLbPerAcre(112.085)).toBeCloseTo(100, 6);
    expect(galPerAcreToLPerHa(1)).toBeCloseTo(9.35396, 6);
    expect(lPerHaToGalPerAcre(93.5396)).toBeCloseTo(10, 6);
    expect(acresToHectares(1)).toBeCloseTo(0.40468564224, 10);
    expect(hectaresToAcres(1)).toBeCloseTo(2.4710538, 6);
  });

  it("°F↔°C at the fixed points of water (212 °F = 100 °C, 32 °F = 0 °C) and −40 = −40", () => {
    expect(fahrenheitToCelsius(212)).toBeCloseTo(100, 10);
    expect(fahrenheitToCelsius(32)).toBeCloseTo(0, 10);
    expect(celsiusToFahrenheit(-40)).toBeCloseTo(-40, 10);
    expect(() => fahrenheitToCelsius(-500)).toThrow(/fahrenheit must be a finite number of at least -459.67/);
  });

  it(`GDD: 1 °C-GDD = 1.8 °F-GDD — ${SRC.amsGlossary}`, () => {
    expect(gddCelsiusToFahrenheit(1)).toBeCloseTo(1.8, 12);
    expect(gddFahrenheitToCelsius(18)).toBeCloseTo(10, 12);
  });

  it(`property: in→cm→in and lb/ac→kg/ha→lb/ac round-trip — ${SRC.nist}`, () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e6, noNaN: true }), (x) => {
        expect(cmToInches(inchesToCm(x))).toBeCloseTo(x, 6);
        expect(kgPerHaToLbPerAcre(lbPerAcreToKgPerHa(x))).toBeCloseTo(x, 6);
        expect(lPerHaToGalPerAcre(galPerAcreToLPerHa(x))).toBeCloseTo(x, 6);
        expect(hectaresToAcres(acresToHectares(x))).toBeCloseTo(x, 6);
      }),
    );
  });

  it("refuses NaN with the argument's name", () => {
    expect(() => inchesToCm(Number.NaN)).toThrow(/inches must be a finite number/);
    expect(() => lbPerAcreToKgPerHa(Number.POSITIVE_INFINITY)).toThrow(/lbPerAcre/);
  });
});

describe("convertForDisplay and formatForDisplay", () => {
  it("US customary is the default and leaves the value alone", () => {
    expect(convertForDisplay(150, "rate_lb_per_acre")).toEqual({ value: 150, unit: "lb/ac" });
  });

  it(`metric: 150 lb/ac → 168.13 kg/ha; 5 gal/ac → 46.77 L/ha — ${SRC.nist}`, () => {
    expect(convertForDisplay(150, "rate_lb_per_acre", "metric").value).toBeCloseTo(168.1275, 4);
    expect(formatForDisplay(5, "rate_gal_per_acre", "metric")).toBe("46.77 L/ha");
    expect(formatForDisplay(86, "temperature_f", "metric", 1)).toBe("30 °C");
  });

  it(`200 bu/ac of corn is about 12.55 t/ha — arithmetic on 56 lb/bu (${SRC.commonPractice}) and ${SRC.nist}`, () => {
    expect(convertForDisplay(200, "yield_bu_per_acre", "metric").value).toBeCloseTo(12.5535, 3);
  });

  it(`32,000 plants/ac is about 79,074 plants/ha — ${SRC.nist}`, () => {
    expect(convertForDisplay(32_000, "plants_per_acre", "metric").value).toBeCloseTo(79_073.7, 0);
  });

  it("refuses unknown quantities and systems", () => {
    expect(() => convertForDisplay(1, "speed" as "length_in")).toThrow(/quantity must be one of/);
    expect(() => convertForDisplay(1, "length_in", "imperial" as "us")).toThrow(
      /system must be one of 'us', 'metric'/,
    );
  });
});

describe("splitFeetInches", () => {
  it("carries 12 inches into a foot", () => {
    expect(splitFeetInches(17.99)).toMatchObject({ feet: 18, inches: 0 });
    expect(splitFeetInches(0)).toMatchObject({ feet: 0, inches: 0 });
  });
});

describe("parseLengthInches", () => {
  const cases: [string, number][] = [
    ["3/4", 0.75],
    ["1 1/2", 1.5],
    ["1-1/2", 1.5],
    ["1½", 1.5],
    ["1.5 in", 1.5],
    ["1.5", 1.5],
    [".5", 0.5],
    ["1,5", 1.5],
    ["4 cm", 4 / 2.54],
    ["40 mm", 4 / 2.54],
    ['1.5"', 1.5],
    ["1.5”", 1.5],
    ["2 in.", 2],
    ["2 inches", 2],
    ["3/4 in", 0.75],
    ["1 ft", 12],
    ["17 ft 5 in", 209],
    [`17' 5"`, 209],
    ["  2 IN  ", 2],
  ];
  for (const [text, inches] of cases) {
    it(`reads ${JSON.stringify(text)} as ${inches.toFixed(4)} in`, () => {
      const r = parseLengthInches(text);
      expect(r.ok).toBe(true);
      if (r.ok) expect(r.value).toBeCloseTo(inches, 10);
    });
  }

  it("reads a bare number in cm when told", () => {
    const r = parseLengthInches("5.08", { defaultUnit: "cm" });
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.value).toBeCloseTo(2, 10);
  });

  it("returns an error value, not an exception, for bad user input", () => {
    for (const text of ["", "   ", "abc", "1/0", "-1", "1..5", "1 1/2/3", "3/4 furlongs", "in"]) {
      const r = parseLengthInches(text);
      expect(r.ok, text).toBe(false);
      if (!r.ok) expect(r.error.length).toBeGreaterThan(0);
    }
    expect(parseLengthInches("-1")).toEqual({ ok: false, error: "A length cannot be negative." });
  });

  it("throws RangeError for API misuse (an unknown default unit)", () => {
    expect(() => parseLengthInches("1", { defaultUnit: "yd" as "in" })).toThrow(RangeError);
  });

  it("property: parse(format(x)) ≈ x in both unit systems", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 1000, noNaN: true }),
        fc.constantFrom("us", "metric" as const),
        (x, system) => {
          const r = parseLengthInches(formatLength(x, system, 4));
          expect(r.ok).toBe(true);
          if (r.ok) expect(Math.abs(r.value - x)).toBeLessThanOrEqual(0.0001);
        },
      ),
    );
  });
});
