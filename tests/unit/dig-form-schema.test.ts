import { describe, expect, it } from "vitest";
import {
  copyPlant,
  type DigFormValues,
  digFormSchema,
  digToFormValues,
  emptyDig,
  emptyPlant,
  FORM_MESSAGES,
  isoToLocalInput,
  localInputToIso,
  type PlantFormValues,
  plantForSummary,
  readInches,
} from "@/lib/digs/form-schema";
import { CM_PER_INCH } from "@/lib/agronomy";
import { digSiteSchema, dugPlantSchema } from "@/sync/protocol";

const SITE_ID = "0b6f3a52-2f0e-4c39-9d55-0d6f0e7d2a11";
const FIELD_ID = "6a1d1f7e-36c1-4b0f-8f61-7a1f0f9b7c21";
const PLANTING_ID = "f3c2a0e4-8a8e-4d7b-9b8e-3c1d2e4f5a61";
const PLANT_IDS = [
  "c1a2b3c4-d5e6-4f70-8a9b-0c1d2e3f4a51",
  "c1a2b3c4-d5e6-4f70-8a9b-0c1d2e3f4a52",
  "c1a2b3c4-d5e6-4f70-8a9b-0c1d2e3f4a53",
] as const;

const plant = (over: Partial<PlantFormValues> = {}, i = 0): PlantFormValues => ({
  ...emptyPlant(PLANT_IDS[i]!),
  leafStage: "V3",
  seedingDepth: "1 3/4",
  crownDepth: "3/4",
  mesocotyl: "healthy",
  seminalScore: "5",
  nodalWhorls: "2",
  nodalCount: "9",
  longestNodal: "5 in",
  ...over,
});

const dig = (over: Partial<DigFormValues> = {}): DigFormValues => ({
  ...emptyDig(SITE_ID, new Date(2026, 4, 1, 10, 30)),
  fieldId: FIELD_ID,
  plantingId: PLANTING_ID,
  irrigatedYet: "no",
  plants: [plant()],
  ...over,
});

function messageAt(values: DigFormValues, path: (string | number)[]): string | undefined {
  const result = digFormSchema.safeParse(values);
  if (result.success) return undefined;
  return result.error.issues.find((i) => JSON.stringify(i.path) === JSON.stringify(path))?.message;
}

const plantValue = (over: Partial<PlantFormValues>) => {
  const out = digFormSchema.parse(dig({ plants: [plant(over)] }));
  return out.plants[0]!;
};

describe("inch fields read the way reps write lengths", () => {
  it.each([
    ["1 1/2", 1.5],
    ["3/4", 0.75],
    ["1.5 in", 1.5],
    ['2"', 2],
    ["1½", 1.5],
    ["1-1/4", 1.25],
    ["1,5", 1.5],
  ])("seeding depth %s → %s in", (text, inches) => {
    expect(plantValue({ seedingDepth: text }).seedingDepthIn).toBeCloseTo(inches, 10);
  });

  it("4 cm is 4 ÷ 2.54 in (1 in = 2.54 cm exactly, NIST)", () => {
    expect(CM_PER_INCH).toBe(2.54);
    expect(plantValue({ crownDepth: "4 cm" }).crownDepthIn).toBeCloseTo(4 / 2.54, 10);
  });

  it("an empty entry is not measured (null), not zero", () => {
    const p = plantValue({ seedingDepth: "", longestNodal: "", bandBeside: "", bandBelow: "" });
    expect(p).toMatchObject({
      seedingDepthIn: null,
      longestNodalIn: null,
      bandBesideIn: null,
      bandBelowIn: null,
    });
  });

  it("a band found above the seed is a negative depth below it; beside cannot be negative", () => {
    expect(plantValue({ bandBelow: "-1/2" }).bandBelowIn).toBe(-0.5);
    expect(readInches("−1 in", { signed: true })).toEqual({ ok: true, value: -1 });
    expect(messageAt(dig({ plants: [plant({ bandBeside: "-1" })] }), ["plants", 0, "bandBeside"])).toBe(
      "A length cannot be negative.",
    );
  });

  it("unreadable text gets the examples of what works", () => {
    expect(messageAt(dig({ plants: [plant({ crownDepth: "deep" })] }), ["plants", 0, "crownDepth"])).toMatch(
      /Could not read "deep" as a length: use a form such as 3\/4, 1 1\/2/,
    );
  });
});

describe("ranges and their messages come from the sync protocol", () => {
  it("seeding depth 0–5 in, crown depth 0–4 in, band below −4 to 12 in", () => {
    const at = (over: Partial<PlantFormValues>, key: keyof PlantFormValues) =>
      messageAt(dig({ plants: [plant(over)] }), ["plants", 0, key]);
    expect(at({ seedingDepth: "5 1/2" }, "seedingDepth")).toBe("The seeding depth must be from 0 to 5 in.");
    expect(at({ crownDepth: "12 cm" }, "crownDepth")).toBe("The crown depth must be from 0 to 4 in.");
    expect(at({ bandBelow: "-5" }, "bandBelow")).toBe(
      "The band distance below the seed must be from -4 to 12 in.",
    );
  });

  it("scores and counts are whole numbers in range", () => {
    const at = (over: Partial<PlantFormValues>, key: keyof PlantFormValues) =>
      messageAt(dig({ plants: [plant(over)] }), ["plants", 0, key]);
    expect(at({ seminalScore: "6" }, "seminalScore")).toBe("The seminal root score must be from 0 to 5.");
    expect(at({ seminalScore: "2.5" }, "seminalScore")).toBe(
      "Enter the seminal root score as a whole number.",
    );
    expect(at({ nodalCount: "lots" }, "nodalCount")).toBe("Enter the nodal root count as a whole number.");
    expect(at({ nodalWhorls: "13" }, "nodalWhorls")).toBe("The nodal whorl count must be from 0 to 12.");
  });

  it("soil temperature in °F from 20 to 120, with or without the unit typed", () => {
    expect(digFormSchema.parse(dig({ soilTempF: "55 °F" })).site.soilTempF).toBe(55);
    expect(digFormSchema.parse(dig({ soilTempF: "52,5" })).site.soilTempF).toBe(52.5);
    expect(messageAt(dig({ soilTempF: "warm" }), ["soilTempF"])).toBe(
      "Enter the soil temperature as a number.",
    );
    expect(messageAt(dig({ soilTempF: "10" }), ["soilTempF"])).toBe(
      "The soil temperature must be from 20 to 120 °F.",
    );
  });

  it("latitude and longitude are in range and come together", () => {
    expect(messageAt(dig({ latitude: "95", longitude: "-120" }), ["latitude"])).toBe(
      "The latitude must be from -90 to 90 °.",
    );
    expect(messageAt(dig({ latitude: "36.87" }), ["longitude"])).toBe(FORM_MESSAGES.bothCoordinates);
    expect(messageAt(dig({ longitude: "-120.3" }), ["latitude"])).toBe(FORM_MESSAGES.bothCoordinates);
  });
});

describe("required entries", () => {
  it("field, dig time, irrigated yet and at least one plant with its leaf stage", () => {
    expect(messageAt(dig({ fieldId: "" }), ["fieldId"])).toBe(FORM_MESSAGES.field);
    expect(messageAt(dig({ dugAt: "" }), ["dugAt"])).toBe(FORM_MESSAGES.dugAt);
    expect(messageAt(dig({ dugAt: "2026-02-30T10:00" }), ["dugAt"])).toBe(FORM_MESSAGES.dugAt);
    expect(messageAt(dig({ irrigatedYet: "" }), ["irrigatedYet"])).toBe(FORM_MESSAGES.irrigatedYet);
    expect(messageAt(dig({ plants: [] }), ["plants"])).toBe(FORM_MESSAGES.plants);
    expect(messageAt(dig({ plants: [plant({ leafStage: "" })] }), ["plants", 0, "leafStage"])).toBe(
      "Choose a leaf stage from VE to V12.",
    );
  });

  it("root measurements may be left empty (the summary says what is missing)", () => {
    const out = digFormSchema.parse(dig({ plants: [{ ...emptyPlant(PLANT_IDS[0]), leafStage: "VE" }] }));
    expect(out.plants[0]).toMatchObject({ seminalScore: null, crownDepthIn: null, mesocotyl: null });
  });
});

describe("the form's output is the protocol's payloads", () => {
  const values = dig({
    latitude: "36.8712",
    longitude: "-120.3391",
    accuracyM: "4.8",
    soilMoisture: "moist",
    soilTempF: "58",
    irrigatedYet: "yes",
    recommendation: "  Dig again in a week.  ",
    flaggedByRep: true,
    plants: [
      plant({ findings: ["band_burn"], bandBeside: "1/2", bandBelow: "2", seminalInjury: "moderate" }),
      plant({ leafStage: "V4" }, 1),
      plant({ leafStage: "V2", notes: "Pulled from the row end." }, 2),
    ],
  });

  it("passes the protocol's own schemas, with positions in order and the site's id on every plant", () => {
    const out = digFormSchema.parse(values);
    expect(digSiteSchema.parse(out.site)).toEqual(out.site);
    for (const p of out.plants) expect(dugPlantSchema.parse(p)).toEqual(p);
    expect(out.plants.map((p) => [p.position, p.digSiteId, p.leafStage])).toEqual([
      [1, SITE_ID, "V3"],
      [2, SITE_ID, "V4"],
      [3, SITE_ID, "V2"],
    ]);
    expect(out.site).toMatchObject({
      latitude: 36.8712,
      longitude: -120.3391,
      accuracyM: 4.8,
      irrigatedYet: true,
      recommendation: "Dig again in a week.",
      flaggedByRep: true,
      plantingId: PLANTING_ID,
      notes: null,
    });
    expect(out.plants[0]).toMatchObject({ bandBesideIn: 0.5, bandBelowIn: 2, findings: ["band_burn"] });
  });

  it("a saved dig comes back into the form and saves to the same payloads", () => {
    const out = digFormSchema.parse(values);
    const again = digFormSchema.parse(digToFormValues(out));
    expect(again).toEqual(out);
  });

  it("no planting chosen is null", () => {
    expect(digFormSchema.parse(dig({ plantingId: "" })).site.plantingId).toBeNull();
  });
});

describe("dig time", () => {
  it("keeps the rep's wall-clock time with the device's offset", () => {
    const iso = localInputToIso("2026-05-01T07:45")!;
    expect(iso).toMatch(/^2026-05-01T07:45:00[+-]\d{2}:\d{2}$/);
    const offset = -new Date(2026, 4, 1, 7, 45).getTimezoneOffset();
    expect(new Date(iso).getTime()).toBe(Date.UTC(2026, 4, 1, 7, 45) - offset * 60_000);
    expect(isoToLocalInput(iso)).toBe("2026-05-01T07:45");
    expect(localInputToIso("yesterday")).toBeNull();
  });
});

describe("plants", () => {
  it("Copy last plant repeats every entry under a new id, without the notes", () => {
    const from = plant({ findings: ["insect_feeding"], notes: "odd one" });
    const copy = copyPlant(from, PLANT_IDS[1]);
    expect(copy).toEqual({ ...from, id: PLANT_IDS[1], notes: "" });
    copy.findings.push("crusting");
    expect(from.findings).toEqual(["insect_feeding"]);
  });

  it("the live summary reads what it can of a half-filled plant", () => {
    expect(plantForSummary(plant({ leafStage: "" }))).toBeNull();
    const half = plantForSummary(plant({ crownDepth: "deep", nodalCount: "", seedingDepth: "1 1/2" }));
    expect(half).toMatchObject({
      leafStage: "V3",
      crownDepthIn: null,
      nodalCount: null,
      seedingDepthIn: 1.5,
    });
  });
});
