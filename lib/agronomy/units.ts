import { checkNumber, checkOneOf } from "./validate";

/** 1 in = 2.54 cm exactly (international inch; NIST, memory). */
export const CM_PER_INCH = 2.54;
/** 1 ft = 0.3048 m exactly (international foot; NIST, memory). */
export const M_PER_FOOT = 0.3048;
/** 1 acre = 43,560 ft² (US customary definition). */
export const SQUARE_FEET_PER_ACRE = 43_560;
/** 1 acre = 4046.8564224 m² (NIST, memory). */
export const SQUARE_METERS_PER_ACRE = 4046.8564224;
/** lb/acre × 1.12085 = kg/ha (NIST, memory). */
export const KG_PER_HA_PER_LB_PER_ACRE = 1.12085;
/** 1 gal/acre = 9.35396 L/ha (NIST, memory). */
export const L_PER_HA_PER_GAL_PER_ACRE = 9.35396;
/** One °C-GDD is 1.8 °F-GDD (American Meteorological Society, Glossary of Meteorology, "corn heat unit"). */
export const F_GDD_PER_C_GDD = 1.8;
/** Test weight of shelled corn at 15.5 % moisture: 56 lb/bu (US legal bushel for corn; common practice, no source). */
export const LB_PER_BUSHEL_CORN = 56;

const HA_PER_ACRE = SQUARE_METERS_PER_ACRE / 10_000;

/** Inches to centimetres. */
export function inchesToCm(inches: number): number {
  return checkNumber("inches", inches) * CM_PER_INCH;
}
/** Centimetres to inches. */
export function cmToInches(cm: number): number {
  return checkNumber("cm", cm) / CM_PER_INCH;
}
/** Feet to metres. */
export function feetToMeters(feet: number): number {
  return checkNumber("feet", feet) * M_PER_FOOT;
}
/** Metres to feet. */
export function metersToFeet(meters: number): number {
  return checkNumber("meters", meters) / M_PER_FOOT;
}
/** lb/acre to kg/ha. */
export function lbPerAcreToKgPerHa(lbPerAcre: number): number {
  return checkNumber("lbPerAcre", lbPerAcre) * KG_PER_HA_PER_LB_PER_ACRE;
}
/** kg/ha to lb/acre. */
export function kgPerHaToLbPerAcre(kgPerHa: number): number {
  return checkNumber("kgPerHa", kgPerHa) / KG_PER_HA_PER_LB_PER_ACRE;
}
/** gal/acre (US gallons) to L/ha. */
export function galPerAcreToLPerHa(galPerAcre: number): number {
  return checkNumber("galPerAcre", galPerAcre) * L_PER_HA_PER_GAL_PER_ACRE;
}
/** L/ha to gal/acre (US gallons). */
export function lPerHaToGalPerAcre(lPerHa: number): number {
  return checkNumber("lPerHa", lPerHa) / L_PER_HA_PER_GAL_PER_ACRE;
}
/** °F to °C. Temperatures below absolute zero are refused. */
export function fahrenheitToCelsius(f: number): number {
  return (checkNumber("fahrenheit", f, { min: -459.67, unit: "°F" }) - 32) / 1.8;
}
/** °C to °F. */
export function celsiusToFahrenheit(c: number): number {
  return checkNumber("celsius", c, { min: -273.15, unit: "°C" }) * 1.8 + 32;
}
/** Acres to hectares. */
export function acresToHectares(acres: number): number {
  return checkNumber("acres", acres) * HA_PER_ACRE;
}
/** Hectares to acres. */
export function hectaresToAcres(hectares: number): number {
  return checkNumber("hectares", hectares) / HA_PER_ACRE;
}
/** °F growing degree days to °C growing degree days (÷ 1.8, AMS Glossary). */
export function gddFahrenheitToCelsius(gddF: number): number {
  return checkNumber("gddF", gddF) / F_GDD_PER_C_GDD;
}
/** °C growing degree days to °F growing degree days (× 1.8, AMS Glossary). */
export function gddCelsiusToFahrenheit(gddC: number): number {
  return checkNumber("gddC", gddC) * F_GDD_PER_C_GDD;
}

export type UnitSystem = "us" | "metric";
export const UNIT_SYSTEMS = ["us", "metric"] as const satisfies readonly UnitSystem[];

/** Quantities the app stores in US customary units and may show in metric. */
export type DisplayQuantity =
  | "length_in"
  | "length_ft"
  | "rate_lb_per_acre"
  | "rate_gal_per_acre"
  | "temperature_f"
  | "gdd_f"
  | "area_acre"
  | "plants_per_acre"
  | "yield_bu_per_acre";

export const DISPLAY_QUANTITIES = [
  "length_in",
  "length_ft",
  "rate_lb_per_acre",
  "rate_gal_per_acre",
  "temperature_f",
  "gdd_f",
  "area_acre",
  "plants_per_acre",
  "yield_bu_per_acre",
] as const satisfies readonly DisplayQuantity[];

const DISPLAY: Record<DisplayQuantity, { us: string; metric: string; toMetric: (v: number) => number }> = {
  length_in: { us: "in", metric: "cm", toMetric: inchesToCm },
  length_ft: { us: "ft", metric: "m", toMetric: feetToMeters },
  rate_lb_per_acre: { us: "lb/ac", metric: "kg/ha", toMetric: lbPerAcreToKgPerHa },
  rate_gal_per_acre: { us: "gal/ac", metric: "L/ha", toMetric: galPerAcreToLPerHa },
  temperature_f: { us: "°F", metric: "°C", toMetric: fahrenheitToCelsius },
  gdd_f: { us: "GDD °F", metric: "GDD °C", toMetric: gddFahrenheitToCelsius },
  area_acre: { us: "ac", metric: "ha", toMetric: acresToHectares },
  plants_per_acre: { us: "plants/ac", metric: "plants/ha", toMetric: (v) => v / HA_PER_ACRE },
  // bu/acre × 56 lb/bu × 0.45359237 kg/lb ÷ 1000 ÷ ha/acre = t/ha (arithmetic on the 56 lb bushel).
  yield_bu_per_acre: {
    us: "bu/ac",
    metric: "t/ha",
    toMetric: (v) => (v * LB_PER_BUSHEL_CORN * 0.45359237) / 1000 / HA_PER_ACRE,
  },
};

/**
 * Converts a stored US customary value for display. US customary is the default; "metric" gives
 * cm, m, kg/ha, L/ha, °C, °C-GDD, ha, plants/ha and t/ha (corn at 15.5 % moisture).
 */
export function convertForDisplay(
  value: number,
  quantity: DisplayQuantity,
  system: UnitSystem = "us",
): { value: number; unit: string } {
  checkNumber("value", value);
  const q = DISPLAY[checkOneOf("quantity", quantity, DISPLAY_QUANTITIES)];
  return checkOneOf("system", system, UNIT_SYSTEMS) === "us"
    ? { value, unit: q.us }
    : { value: q.toMetric(value), unit: q.metric };
}

function trimNumber(value: number, decimals: number): string {
  const rounded = Number(value.toFixed(decimals));
  return String(Object.is(rounded, -0) ? 0 : rounded);
}

/** Formats a stored value with its display unit, e.g. "1.5 in" or "3.81 cm". */
export function formatForDisplay(
  value: number,
  quantity: DisplayQuantity,
  system: UnitSystem = "us",
  decimals = 2,
): string {
  checkNumber("decimals", decimals, { min: 0, max: 10, integer: true });
  const shown = convertForDisplay(value, quantity, system);
  return `${trimNumber(shown.value, decimals)} ${shown.unit}`;
}

/** Formats a length held in inches as "1.5 in" (US) or "3.81 cm" (metric); parseLengthInches reads both back. */
export function formatLength(inches: number, system: UnitSystem = "us", decimals = 2): string {
  return formatForDisplay(inches, "length_in", system, decimals);
}

/** Feet and whole inches for a length in feet, e.g. 17.424 ft → { feet: 17, inches: 5 } ("17 ft 5 in"). */
export function splitFeetInches(feet: number): { feet: number; inches: number; text: string } {
  checkNumber("feet", feet, { min: 0, unit: "ft" });
  const totalInches = Math.round(feet * 12);
  const whole = Math.floor(totalInches / 12);
  const inches = totalInches - whole * 12;
  return { feet: whole, inches, text: `${whole} ft ${inches} in` };
}

export type ParseResult = { ok: true; value: number } | { ok: false; error: string };

type LengthUnit = "in" | "cm" | "mm" | "m" | "ft";

const INCHES_PER_UNIT: Record<LengthUnit, number> = {
  in: 1,
  ft: 12,
  cm: 1 / CM_PER_INCH,
  mm: 1 / (10 * CM_PER_INCH),
  m: 100 / CM_PER_INCH,
};

const UNIT_WORDS: Record<string, LengthUnit> = {
  in: "in",
  "in.": "in",
  inch: "in",
  inches: "in",
  '"': "in",
  cm: "cm",
  mm: "mm",
  m: "m",
  ft: "ft",
  "ft.": "ft",
  foot: "ft",
  feet: "ft",
  "'": "ft",
};

const VULGAR_FRACTIONS: Record<string, string> = {
  "½": "1/2",
  "¼": "1/4",
  "¾": "3/4",
  "⅛": "1/8",
  "⅜": "3/8",
  "⅝": "5/8",
  "⅞": "7/8",
};

const HINT = 'use a form such as 3/4, 1 1/2, 1.5 in, 1.5" or 4 cm';

/** Reads "1.5", "1,5", ".5", "3/4", "1 1/2" or "1-1/2"; null when the text is none of those. */
function parseAmount(text: string): number | null | "zero-denominator" {
  const decimal = /^(\d+(?:[.,]\d+)?|[.,]\d+)$/.exec(text);
  if (decimal?.[1] !== undefined) return Number(decimal[1].replace(",", "."));
  const fraction = /^(?:(\d+)(?:\s+|\s*-\s*))?(\d+)\s*\/\s*(\d+)$/.exec(text);
  if (fraction?.[2] !== undefined && fraction[3] !== undefined) {
    const denominator = Number(fraction[3]);
    if (denominator === 0) return "zero-denominator";
    return Number(fraction[1] ?? 0) + Number(fraction[2]) / denominator;
  }
  return null;
}

function parseSingle(text: string, defaultUnit: LengthUnit): ParseResult {
  const match = /^(.*?)\s*(in\.|inches|inch|in|"|cm|mm|m|ft\.|feet|foot|ft|')?$/.exec(text);
  const amountText = match?.[1]?.trim() ?? "";
  const amount = parseAmount(amountText);
  if (amount === "zero-denominator") return { ok: false, error: "A fraction cannot have 0 below the line." };
  if (amount === null) return { ok: false, error: `Could not read "${text}" as a length: ${HINT}.` };
  const unitWord = match?.[2];
  const unit = unitWord === undefined ? defaultUnit : (UNIT_WORDS[unitWord] ?? defaultUnit);
  return { ok: true, value: amount * INCHES_PER_UNIT[unit] };
}

/**
 * Parses a length typed in the field and returns inches. Accepts decimals (with "." or ","),
 * fractions ("3/4", "1 1/2", "1-1/2", "1½"), units in, inch, ", cm, mm, m, ft, ' and feet-and-inches
 * ("17 ft 5 in", `17' 5"`). A bare number is read in `defaultUnit` (inches unless told).
 * User input, so failures are values: { ok: false, error } with a plain-English message.
 */
export function parseLengthInches(text: string, options: { defaultUnit?: "in" | "cm" } = {}): ParseResult {
  const defaultUnit = checkOneOf("options.defaultUnit", options.defaultUnit ?? "in", ["in", "cm"] as const);
  if (typeof text !== "string") return { ok: false, error: "Enter a length." };
  let s = text.trim().toLowerCase();
  for (const [glyph, plain] of Object.entries(VULGAR_FRACTIONS)) s = s.replaceAll(glyph, ` ${plain}`);
  s = s
    .replace(/[″”“]|''/g, '"')
    .replace(/[′’‘]/g, "'")
    .replace(/\s+/g, " ")
    .trim();
  if (s === "") return { ok: false, error: "Enter a length." };
  if (s.startsWith("-")) return { ok: false, error: "A length cannot be negative." };

  const feetAndInches = /^(.+?)\s*(?:ft\.?|feet|foot|')\s*(.+)$/.exec(s);
  if (feetAndInches?.[1] !== undefined && feetAndInches[2] !== undefined) {
    const feet = parseAmount(feetAndInches[1].trim());
    const rest = parseSingle(feetAndInches[2], "in");
    if (typeof feet === "number" && rest.ok) return { ok: true, value: feet * 12 + rest.value };
    return { ok: false, error: `Could not read "${text.trim()}" as a length: ${HINT}.` };
  }
  const single = parseSingle(s, defaultUnit);
  if (!single.ok && single.error.startsWith("Could not")) {
    return { ok: false, error: `Could not read "${text.trim()}" as a length: ${HINT}.` };
  }
  return single;
}
