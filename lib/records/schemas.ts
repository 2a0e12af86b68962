import { z } from "zod";

// Bodies of the record routes, shared with the office forms that edit the same records. Every bound
// is a realistic range for corn in the field; a value outside it is a typo, not an agronomic choice.

export const SOIL_TEXTURES = ["coarse", "medium", "fine"] as const;
export const IRRIGATION_METHODS = ["furrow", "sprinkler", "drip", "none"] as const;
export const PLACEMENTS = ["seed_placed", "band_2x2", "side_dress", "broadcast"] as const;
export const RATE_UNITS = ["lb/ac", "gal/ac"] as const;
export const PRODUCT_FORMS = ["liquid", "dry", "gas"] as const;

export const RECORD_LIMITS = {
  rowSpacingIn: { min: 7.5, max: 60 },
  seedingDepthIn: { min: 0.5, max: 4 },
  seedingRate: { min: 10_000, max: 60_000 },
  rate: { min: 0, max: 500 },
  gradePercent: { min: 0, max: 100 },
  // Beside the seed row, up to half of the widest row spacing; below the seed, negative when above it.
  besideIn: { min: 0, max: 30 },
  belowIn: { min: -4, max: 12 },
  lbPerGal: { min: 4, max: 16 },
  saltIndex: { min: 0, max: 300 },
} as const;

// Record ids are UUIDs made by the server or on a device; anything else can name no record.
export const recordIdSchema = z.guid();

export function isRecordId(value: string): boolean {
  return recordIdSchema.safeParse(value).success;
}

const dateSchema = (what: string) =>
  z.iso.date({ error: `Enter the ${what} as YYYY-MM-DD, for example 2026-04-28.` });

function boundedNumber(what: string, { min, max }: { min: number; max: number }, unit: string) {
  const range = `from ${min.toLocaleString("en-US")} to ${max.toLocaleString("en-US")}${unit ? ` ${unit}` : ""}`;
  return z
    .number({ error: `Enter the ${what} as a number ${range}.` })
    .min(min, { error: `The ${what} must be ${range}.` })
    .max(max, { error: `The ${what} must be ${range}.` });
}

function text(what: string, max: number) {
  return z
    .string({ error: `Enter the ${what}.` })
    .trim()
    .min(1, { error: `Enter the ${what}.` })
    .max(max, { error: `Keep the ${what} to ${max} characters.` });
}

// Optional free text: an empty string clears it.
function optionalText(what: string, max: number) {
  return z
    .string({ error: `Enter the ${what} as text.` })
    .trim()
    .max(max, { error: `Keep the ${what} to ${max} characters.` })
    .nullable()
    .transform((v) => (v ? v : null));
}

function oneOf<T extends readonly [string, ...string[]]>(what: string, values: T) {
  return z.enum(values, { error: `Choose the ${what}: one of ${values.join(", ")}.` });
}

const atLeastOne = (body: object) => Object.keys(body).length > 0;
const atLeastOneMessage = { error: "Send at least one value to change." };

export const accountUpdateSchema = z
  .strictObject({
    name: text("account name", 120),
    locality: optionalText("locality", 120),
  })
  .partial()
  .refine(atLeastOne, atLeastOneMessage);

export const fieldFields = {
  name: text("field name", 120),
  soilTexture: oneOf("soil texture", SOIL_TEXTURES),
  irrigation: oneOf("irrigation", IRRIGATION_METHODS),
  firstIrrigationOn: dateSchema("first irrigation date").nullable(),
};

export const fieldUpdateSchema = z.strictObject(fieldFields).partial().refine(atLeastOne, atLeastOneMessage);

export const plantingFields = {
  hybrid: text("hybrid", 80),
  plantedOn: dateSchema("planting date"),
  seedingRate: boundedNumber("seeding rate", RECORD_LIMITS.seedingRate, "seeds/ac"),
  seedingDepthIn: boundedNumber("seeding depth", RECORD_LIMITS.seedingDepthIn, "in"),
  rowSpacingIn: boundedNumber("row spacing", RECORD_LIMITS.rowSpacingIn, "in"),
  soilTexture: oneOf("soil texture", SOIL_TEXTURES),
  notes: optionalText("notes", 4000),
};

export const plantingCreateSchema = z.strictObject(plantingFields);

export const plantingUpdateSchema = z
  .strictObject(plantingFields)
  .partial()
  .refine(atLeastOne, atLeastOneMessage);

export const fertilizerPassFields = {
  productId: z.guid({ error: "Choose a product from the catalog." }),
  appliedOn: dateSchema("application date"),
  rate: boundedNumber("rate", RECORD_LIMITS.rate, "lb/ac or gal/ac"),
  rateUnit: oneOf("rate unit", RATE_UNITS),
  placement: oneOf("placement", PLACEMENTS),
  intendedBesideIn: boundedNumber("distance beside the seed", RECORD_LIMITS.besideIn, "in").nullable(),
  intendedBelowIn: boundedNumber("distance below the seed", RECORD_LIMITS.belowIn, "in").nullable(),
  notes: optionalText("notes", 4000),
};

// A new pass belongs to one planting of the field, or to the whole field (null).
export const fertilizerPassCreateSchema = z.strictObject({
  ...fertilizerPassFields,
  plantingId: z.guid({ error: "Choose a planting of this field, or the whole field." }).nullable(),
});

export const fertilizerPassUpdateSchema = z
  .strictObject(fertilizerPassFields)
  .partial()
  .refine(atLeastOne, atLeastOneMessage);

const source = (what: string) => text(`source of the ${what}`, 300);

// A published number is stored only together with where it came from.
export const productCreateSchema = z
  .strictObject({
    name: text("product name", 120),
    chemistry: text("chemistry", 200),
    form: oneOf("form", PRODUCT_FORMS),
    gradeN: boundedNumber("N grade", RECORD_LIMITS.gradePercent, "%"),
    gradeP2o5: boundedNumber("P2O5 grade", RECORD_LIMITS.gradePercent, "%"),
    gradeK2o: boundedNumber("K2O grade", RECORD_LIMITS.gradePercent, "%"),
    gradeS: boundedNumber("S grade", RECORD_LIMITS.gradePercent, "%").default(0),
    lbPerGal: boundedNumber("density", RECORD_LIMITS.lbPerGal, "lb/gal").nullable().default(null),
    densitySource: source("density").nullable().default(null),
    saltIndex: boundedNumber("salt index", RECORD_LIMITS.saltIndex, "").nullable().default(null),
    saltIndexSource: source("salt index").nullable().default(null),
    containsUrea: z
      .boolean({ error: "Say whether the product contains urea (true or false)." })
      .default(false),
    containsThiosulfate: z
      .boolean({ error: "Say whether the product contains thiosulfate (true or false)." })
      .default(false),
  })
  .superRefine((p, ctx) => {
    if (p.form === "liquid" && p.lbPerGal === null) {
      ctx.addIssue({
        code: "custom",
        path: ["lbPerGal"],
        message: "Enter the density (lb/gal) of a liquid product; gal/ac rates need it.",
      });
    }
    if ((p.lbPerGal === null) !== (p.densitySource === null)) {
      ctx.addIssue({
        code: "custom",
        path: [p.lbPerGal === null ? "lbPerGal" : "densitySource"],
        message: "Enter the density together with its source.",
      });
    }
    if ((p.saltIndex === null) !== (p.saltIndexSource === null)) {
      ctx.addIssue({
        code: "custom",
        path: [p.saltIndex === null ? "saltIndex" : "saltIndexSource"],
        message: "Enter the salt index together with its source.",
      });
    }
  });

export type AccountPatch = z.infer<typeof accountUpdateSchema>;
export type FieldPatch = z.infer<typeof fieldUpdateSchema>;
export type PlantingCreate = z.infer<typeof plantingCreateSchema>;
export type PlantingPatch = z.infer<typeof plantingUpdateSchema>;
export type FertilizerPassCreate = z.infer<typeof fertilizerPassCreateSchema>;
export type FertilizerPassPatch = z.infer<typeof fertilizerPassUpdateSchema>;
export type ProductCreate = z.infer<typeof productCreateSchema>;
