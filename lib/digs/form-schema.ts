import { z } from "zod";
import { parseLengthInches } from "@/lib/agronomy";
import {
  type DigSitePayload,
  type DugPlantPayload,
  digSiteSchema,
  dugPlantSchema,
  type FINDINGS,
  type INJURY,
  type LEAF_STAGES,
  type MESOCOTYL,
  type SOIL_MOISTURE,
} from "@/sync/protocol";
import type { AssessmentPlant, AssessmentSite } from "./assessment";

// The dig form: what the rep types (strings, so "1 1/2" and "3/4 in" survive until submit) and how it
// becomes the sync payloads. Every range and its message comes from the protocol's schemas, so the form
// refuses exactly what the phone's write path and the server would refuse.

export type LeafStage = (typeof LEAF_STAGES)[number];
export type Mesocotyl = (typeof MESOCOTYL)[number];
export type Injury = (typeof INJURY)[number];
export type SoilMoisture = (typeof SOIL_MOISTURE)[number];
export type FindingCode = (typeof FINDINGS)[number];

export interface PlantFormValues {
  id: string;
  leafStage: LeafStage | "";
  seedingDepth: string;
  crownDepth: string;
  mesocotyl: Mesocotyl | "";
  seminalScore: string;
  nodalWhorls: string;
  nodalCount: string;
  longestNodal: string;
  seminalInjury: Injury;
  nodalInjury: Injury;
  findings: FindingCode[];
  bandBeside: string;
  bandBelow: string;
  notes: string;
}

export interface DigFormValues {
  id: string;
  fieldId: string;
  plantingId: string;
  /** Local wall-clock time as an <input type="datetime-local"> holds it: YYYY-MM-DDTHH:mm. */
  dugAt: string;
  latitude: string;
  longitude: string;
  /** From the device's location fix, metres; empty when the position was typed by hand. */
  accuracyM: string;
  soilMoisture: SoilMoisture | "";
  soilTempF: string;
  irrigatedYet: "yes" | "no" | "";
  recommendation: string;
  flaggedByRep: boolean;
  notes: string;
  plants: PlantFormValues[];
}

export const FORM_MESSAGES = {
  field: "Choose the field you dug in.",
  dugAt: "Enter the date and time of the dig.",
  irrigatedYet: "Say whether the field has been irrigated yet.",
  bothCoordinates: "Enter both latitude and longitude, or neither.",
  plants: "Add at least one dug plant.",
  tooManyPlants: "A dig holds at most 50 plants.",
} as const;

const site = digSiteSchema.shape;
const plant = dugPlantSchema.shape;

/** "" → null; "1,5" → 1.5; anything that is not a plain number → NaN (the protocol names the field). */
export function readNumber(text: string): number | null {
  const s = text
    .trim()
    .replace(/\s*°?\s*f$/i, "")
    .replace(/^−/, "-");
  if (s === "") return null;
  const normalized = s.replace(",", ".");
  return /^[-+]?(\d+\.?\d*|\.\d+)$/.test(normalized) ? Number(normalized) : Number.NaN;
}

type Parsed = { ok: true; value: number | null } | { ok: false; error: string };

/**
 * Reads a length typed in the field as inches: "3/4", "1 1/2", "1.5 in", `1.5"`, "4 cm". With
 * `signed`, a leading minus is allowed (a band found above the seed). Empty → null.
 */
export function readInches(text: string, options: { signed?: boolean } = {}): Parsed {
  const s = text.trim().replace(/^−/, "-");
  if (s === "") return { ok: true, value: null };
  const negative = options.signed === true && s.startsWith("-");
  const parsed = parseLengthInches(negative ? s.slice(1) : s);
  if (!parsed.ok) return { ok: false, error: parsed.error };
  return { ok: true, value: negative ? -parsed.value : parsed.value };
}

const numberField = (target: z.ZodType<number | null, number | null>) =>
  z
    .string()
    .transform((s) => readNumber(s))
    .pipe(target);

const inchField = (target: z.ZodType<number | null, number | null>, signed = false) =>
  z
    .string()
    .transform((s, ctx) => {
      const parsed = readInches(s, { signed });
      if (!parsed.ok) {
        ctx.addIssue({ code: "custom", message: parsed.error });
        return z.NEVER;
      }
      return parsed.value;
    })
    .pipe(target);

const optionalText = (target: z.ZodType<string | null, string | null>) =>
  z
    .string()
    .transform((s) => (s.trim() === "" ? null : s))
    .pipe(target);

const emptyToNull = <T extends string>(target: z.ZodType<T | null, T | null>) =>
  z
    .string()
    .transform((s) => (s === "" ? null : s))
    .pipe(target);

/** Local wall-clock "YYYY-MM-DDTHH:mm[:ss]" → ISO 8601 with the device's offset at that time. */
export function localInputToIso(value: string): string | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/.exec(value.trim());
  if (!m) return null;
  const [, y, mo, d, h, mi, s = "00"] = m;
  const local = new Date(Number(y), Number(mo) - 1, Number(d), Number(h), Number(mi), Number(s));
  if (Number.isNaN(local.getTime()) || local.getDate() !== Number(d) || local.getHours() !== Number(h)) {
    return null;
  }
  const offset = -local.getTimezoneOffset();
  const sign = offset >= 0 ? "+" : "-";
  const abs = Math.abs(offset);
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${y}-${mo}-${d}T${h}:${mi}:${s}${sign}${pad(Math.floor(abs / 60))}:${pad(abs % 60)}`;
}

/** An instant → the device's wall-clock "YYYY-MM-DDTHH:mm" for a datetime-local input. */
export function isoToLocalInput(iso: string | Date): string {
  const d = typeof iso === "string" ? new Date(iso) : iso;
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

export const plantFormSchema = z.object({
  id: plant.id,
  leafStage: z.string().pipe(plant.leafStage),
  seedingDepth: inchField(plant.seedingDepthIn),
  crownDepth: inchField(plant.crownDepthIn),
  mesocotyl: emptyToNull(plant.mesocotyl),
  seminalScore: numberField(plant.seminalScore),
  nodalWhorls: numberField(plant.nodalWhorls),
  nodalCount: numberField(plant.nodalCount),
  longestNodal: inchField(plant.longestNodalIn),
  seminalInjury: plant.seminalInjury,
  nodalInjury: plant.nodalInjury,
  findings: plant.findings,
  bandBeside: inchField(plant.bandBesideIn),
  bandBelow: inchField(plant.bandBelowIn, true),
  notes: optionalText(plant.notes),
});

export const digFormSchema = z
  .object({
    id: site.id,
    fieldId: z.string().min(1, { error: FORM_MESSAGES.field }).pipe(site.fieldId),
    plantingId: emptyToNull(site.plantingId),
    dugAt: z
      .string()
      .transform((s, ctx) => {
        const iso = localInputToIso(s);
        if (iso === null) {
          ctx.addIssue({ code: "custom", message: FORM_MESSAGES.dugAt });
          return z.NEVER;
        }
        return iso;
      })
      .pipe(site.dugAt),
    latitude: numberField(site.latitude),
    longitude: numberField(site.longitude),
    accuracyM: numberField(site.accuracyM),
    soilMoisture: emptyToNull(site.soilMoisture),
    soilTempF: numberField(site.soilTempF),
    irrigatedYet: z.enum(["yes", "no"], { error: FORM_MESSAGES.irrigatedYet }).transform((v) => v === "yes"),
    recommendation: optionalText(site.recommendation),
    flaggedByRep: site.flaggedByRep,
    notes: optionalText(site.notes),
    plants: z
      .array(plantFormSchema)
      .min(1, { error: FORM_MESSAGES.plants })
      .max(50, { error: FORM_MESSAGES.tooManyPlants }),
  })
  .superRefine((v, ctx) => {
    if ((v.latitude === null) !== (v.longitude === null)) {
      const path = v.latitude === null ? "latitude" : "longitude";
      ctx.addIssue({ code: "custom", message: FORM_MESSAGES.bothCoordinates, path: [path] });
    }
  })
  .transform((v): { site: DigSitePayload; plants: DugPlantPayload[] } => ({
    site: {
      id: v.id,
      fieldId: v.fieldId,
      plantingId: v.plantingId,
      dugAt: v.dugAt,
      latitude: v.latitude,
      longitude: v.longitude,
      accuracyM: v.accuracyM,
      soilMoisture: v.soilMoisture,
      soilTempF: v.soilTempF,
      irrigatedYet: v.irrigatedYet,
      recommendation: v.recommendation,
      flaggedByRep: v.flaggedByRep,
      notes: v.notes,
    },
    plants: v.plants.map((p, i) => ({
      id: p.id,
      digSiteId: v.id,
      position: i + 1,
      leafStage: p.leafStage,
      seedingDepthIn: p.seedingDepth,
      crownDepthIn: p.crownDepth,
      mesocotyl: p.mesocotyl,
      seminalScore: p.seminalScore,
      nodalWhorls: p.nodalWhorls,
      nodalCount: p.nodalCount,
      longestNodalIn: p.longestNodal,
      seminalInjury: p.seminalInjury,
      nodalInjury: p.nodalInjury,
      findings: p.findings,
      bandBesideIn: p.bandBeside,
      bandBelowIn: p.bandBelow,
      notes: p.notes,
    })),
  }));

export type DigFormOutput = z.output<typeof digFormSchema>;

export function emptyPlant(id: string): PlantFormValues {
  return {
    id,
    leafStage: "",
    seedingDepth: "",
    crownDepth: "",
    mesocotyl: "",
    seminalScore: "",
    nodalWhorls: "",
    nodalCount: "",
    longestNodal: "",
    seminalInjury: "none",
    nodalInjury: "none",
    findings: [],
    bandBeside: "",
    bandBelow: "",
    notes: "",
  };
}

/** "Copy last plant": every entry of the plant before, under a new id, without its notes. */
export function copyPlant(from: PlantFormValues, id: string): PlantFormValues {
  return { ...from, id, findings: [...from.findings], notes: "" };
}

export function emptyDig(id: string, now: Date = new Date()): DigFormValues {
  return {
    id,
    fieldId: "",
    plantingId: "",
    dugAt: isoToLocalInput(now),
    latitude: "",
    longitude: "",
    accuracyM: "",
    soilMoisture: "",
    soilTempF: "",
    irrigatedYet: "",
    recommendation: "",
    flaggedByRep: false,
    notes: "",
    plants: [],
  };
}

const str = (n: number | null) => (n === null ? "" : String(n));

/** A saved dig back into the form, to edit it. */
export function digToFormValues(saved: { site: DigSitePayload; plants: DugPlantPayload[] }): DigFormValues {
  const s = saved.site;
  return {
    id: s.id,
    fieldId: s.fieldId,
    plantingId: s.plantingId ?? "",
    dugAt: isoToLocalInput(s.dugAt),
    latitude: str(s.latitude),
    longitude: str(s.longitude),
    accuracyM: str(s.accuracyM),
    soilMoisture: s.soilMoisture ?? "",
    soilTempF: str(s.soilTempF),
    irrigatedYet: s.irrigatedYet ? "yes" : "no",
    recommendation: s.recommendation ?? "",
    flaggedByRep: s.flaggedByRep,
    notes: s.notes ?? "",
    plants: [...saved.plants]
      .sort((a, b) => a.position - b.position)
      .map((p) => ({
        id: p.id,
        leafStage: p.leafStage,
        seedingDepth: str(p.seedingDepthIn),
        crownDepth: str(p.crownDepthIn),
        mesocotyl: p.mesocotyl ?? "",
        seminalScore: str(p.seminalScore),
        nodalWhorls: str(p.nodalWhorls),
        nodalCount: str(p.nodalCount),
        longestNodal: str(p.longestNodalIn),
        seminalInjury: p.seminalInjury,
        nodalInjury: p.nodalInjury,
        findings: [...p.findings],
        bandBeside: str(p.bandBesideIn),
        bandBelow: str(p.bandBelowIn),
        notes: p.notes ?? "",
      })),
  };
}

function lenient<T>(schema: z.ZodType<T>, value: unknown): T | null {
  const r = schema.safeParse(value);
  return r.success ? r.data : null;
}

/**
 * What the live summary can use of a half-filled plant: each entry that reads cleanly, null for the
 * rest. Null when the leaf stage is not chosen yet (the index is relative to it).
 */
export function plantForSummary(p: PlantFormValues): AssessmentPlant | null {
  const leafStage = lenient(plantFormSchema.shape.leafStage, p.leafStage);
  if (leafStage === null) return null;
  const shape = plantFormSchema.shape;
  return {
    leafStage,
    seedingDepthIn: lenient(shape.seedingDepth, p.seedingDepth),
    crownDepthIn: lenient(shape.crownDepth, p.crownDepth),
    mesocotyl: lenient(shape.mesocotyl, p.mesocotyl),
    seminalScore: lenient(shape.seminalScore, p.seminalScore),
    nodalWhorls: lenient(shape.nodalWhorls, p.nodalWhorls),
    nodalCount: lenient(shape.nodalCount, p.nodalCount),
    longestNodalIn: lenient(shape.longestNodal, p.longestNodal),
    seminalInjury: lenient(shape.seminalInjury, p.seminalInjury) ?? "none",
    nodalInjury: lenient(shape.nodalInjury, p.nodalInjury) ?? "none",
    findings: lenient(shape.findings, p.findings) ?? [],
    bandBesideIn: lenient(shape.bandBeside, p.bandBeside),
    bandBelowIn: lenient(shape.bandBelow, p.bandBelow),
  };
}

/** The site as the live summary needs it; the dig time falls back to `now` while it is being typed. */
export function siteForSummary(v: Pick<DigFormValues, "fieldId" | "plantingId" | "dugAt">, now = new Date()) {
  const site: AssessmentSite = {
    fieldId: v.fieldId,
    plantingId: v.plantingId === "" ? null : v.plantingId,
    dugAt: localInputToIso(v.dugAt) ?? localInputToIso(isoToLocalInput(now))!,
  };
  return site;
}
