/**
 * Generic fertilizer products by chemistry and grade (never trade names), with density and salt index
 * where a figure is at hand. Every number names its source and how sure we are of it; the database
 * seed imports this list.
 */

/** How a figure was obtained (see shared/REFERENCES.md). */
export type Confidence = "read" | "quoted" | "arith" | "memory" | "common practice, no source";

export interface SourceNote {
  property: "grade" | "lbPerGal" | "saltIndex";
  source: string;
  confidence: Confidence;
  note?: string;
}

export type ProductForm = "liquid" | "solid" | "pressurized liquid";

export interface FertilizerProduct {
  id: string;
  name: string;
  chemistry: string;
  form: ProductForm;
  /** Grade, % by weight: N, P2O5, K2O and S. */
  n: number;
  p2o5: number;
  k2o: number;
  s: number;
  /** Density at about 60 °F, lb/gal; null for dry products. */
  lbPerGal: number | null;
  /** Salt index relative to sodium nitrate = 100; null when no figure is at hand. */
  saltIndex: number | null;
  /** Urea-containing products release ammonia near the seed (K-State starter eUpdate). */
  containsUrea: boolean;
  /** Thiosulfate does not belong with the seed (K-State starter eUpdate). */
  containsThiosulfate: boolean;
  sources: SourceNote[];
}

const GRADE: SourceNote = {
  property: "grade",
  source: "grade as named (N-P2O5-K2O-S, % by weight)",
  confidence: "common practice, no source",
};
const VCE: SourceNote = {
  property: "lbPerGal",
  source: 'Virginia Cooperative Extension, "Common Fertilizers Used in Virginia", SPES-199NP',
  confidence: "read",
};
const INDUSTRY_SHEET: SourceNote = {
  property: "lbPerGal",
  source: "industry physical-properties sheet",
  confidence: "quoted",
};
const RADER: SourceNote = {
  property: "saltIndex",
  source: "Rader, White and Whittaker, Soil Science 55:201–218 (1943), as reproduced in fertilizer handbooks",
  confidence: "memory",
};
const NO_SALT_INDEX: SourceNote = {
  property: "saltIndex",
  source: "none at hand",
  confidence: "memory",
  note: "Not in the 1943 table as remembered; left null rather than guessed.",
};

export const FERTILIZER_PRODUCTS: readonly FertilizerProduct[] = [
  {
    id: "ammonium-polyphosphate-10-34-0",
    name: "ammonium polyphosphate 10-34-0",
    chemistry: "ammonium polyphosphate solution",
    form: "liquid",
    n: 10,
    p2o5: 34,
    k2o: 0,
    s: 0,
    lbPerGal: 11.65,
    saltIndex: null,
    containsUrea: false,
    containsThiosulfate: false,
    sources: [
      GRADE,
      {
        ...INDUSTRY_SHEET,
        note: "Some extension lessons use 11.4 lb/gal; density stays a product property.",
      },
      NO_SALT_INDEX,
    ],
  },
  {
    id: "uan-32",
    name: "UAN-32 (urea ammonium nitrate 32-0-0)",
    chemistry: "urea ammonium nitrate solution",
    form: "liquid",
    n: 32,
    p2o5: 0,
    k2o: 0,
    s: 0,
    lbPerGal: 11.06,
    saltIndex: null,
    containsUrea: true,
    containsThiosulfate: false,
    sources: [GRADE, INDUSTRY_SHEET, NO_SALT_INDEX],
  },
  {
    id: "uan-30",
    name: "UAN-30 (urea ammonium nitrate 30-0-0)",
    chemistry: "urea ammonium nitrate solution",
    form: "liquid",
    n: 30,
    p2o5: 0,
    k2o: 0,
    s: 0,
    lbPerGal: 10.9,
    saltIndex: null,
    containsUrea: true,
    containsThiosulfate: false,
    sources: [GRADE, VCE, NO_SALT_INDEX],
  },
  {
    id: "uan-28",
    name: "UAN-28 (urea ammonium nitrate 28-0-0)",
    chemistry: "urea ammonium nitrate solution",
    form: "liquid",
    n: 28,
    p2o5: 0,
    k2o: 0,
    s: 0,
    lbPerGal: 10.67,
    saltIndex: null,
    containsUrea: true,
    containsThiosulfate: false,
    sources: [GRADE, VCE, NO_SALT_INDEX],
  },
  {
    id: "ammonium-thiosulfate-12-0-0-26s",
    name: "ammonium thiosulfate 12-0-0-26S",
    chemistry: "ammonium thiosulfate solution",
    form: "liquid",
    n: 12,
    p2o5: 0,
    k2o: 0,
    s: 26,
    lbPerGal: 11.04,
    saltIndex: null,
    containsUrea: false,
    containsThiosulfate: true,
    sources: [GRADE, INDUSTRY_SHEET, NO_SALT_INDEX],
  },
  {
    id: "potassium-thiosulfate-0-0-25-17s",
    name: "potassium thiosulfate 0-0-25-17S",
    chemistry: "potassium thiosulfate solution",
    form: "liquid",
    n: 0,
    p2o5: 0,
    k2o: 25,
    s: 17,
    lbPerGal: 12.2,
    saltIndex: null,
    containsUrea: false,
    containsThiosulfate: true,
    sources: [
      GRADE,
      {
        property: "lbPerGal",
        source: "industry physical-properties sheet",
        confidence: "memory",
        note: "About 1.46 specific gravity as remembered; check the product's own sheet.",
      },
      NO_SALT_INDEX,
    ],
  },
  {
    id: "urea-46-0-0",
    name: "urea 46-0-0",
    chemistry: "urea",
    form: "solid",
    n: 46,
    p2o5: 0,
    k2o: 0,
    s: 0,
    lbPerGal: null,
    saltIndex: 75.4,
    containsUrea: true,
    containsThiosulfate: false,
    sources: [GRADE, RADER],
  },
  {
    id: "anhydrous-ammonia-82-0-0",
    name: "anhydrous ammonia 82-0-0",
    chemistry: "anhydrous ammonia",
    form: "pressurized liquid",
    n: 82,
    p2o5: 0,
    k2o: 0,
    s: 0,
    lbPerGal: 5.15,
    saltIndex: 47.1,
    containsUrea: false,
    containsThiosulfate: false,
    sources: [
      GRADE,
      { property: "lbPerGal", source: "liquid ammonia at about 60 °F", confidence: "memory" },
      RADER,
    ],
  },
  {
    id: "monoammonium-phosphate-11-52-0",
    name: "monoammonium phosphate 11-52-0",
    chemistry: "monoammonium phosphate",
    form: "solid",
    n: 11,
    p2o5: 52,
    k2o: 0,
    s: 0,
    lbPerGal: null,
    saltIndex: 29.9,
    containsUrea: false,
    containsThiosulfate: false,
    sources: [GRADE, RADER],
  },
  {
    id: "diammonium-phosphate-18-46-0",
    name: "diammonium phosphate 18-46-0",
    chemistry: "diammonium phosphate",
    form: "solid",
    n: 18,
    p2o5: 46,
    k2o: 0,
    s: 0,
    lbPerGal: null,
    saltIndex: 34.2,
    containsUrea: false,
    containsThiosulfate: false,
    sources: [GRADE, RADER],
  },
  {
    id: "potassium-chloride-0-0-60",
    name: "potassium chloride 0-0-60",
    chemistry: "potassium chloride",
    form: "solid",
    n: 0,
    p2o5: 0,
    k2o: 60,
    s: 0,
    lbPerGal: null,
    saltIndex: 116.3,
    containsUrea: false,
    containsThiosulfate: false,
    sources: [GRADE, RADER],
  },
  {
    id: "ammonium-sulfate-21-0-0-24s",
    name: "ammonium sulfate 21-0-0-24S",
    chemistry: "ammonium sulfate",
    form: "solid",
    n: 21,
    p2o5: 0,
    k2o: 0,
    s: 24,
    lbPerGal: null,
    saltIndex: 69.0,
    containsUrea: false,
    containsThiosulfate: false,
    sources: [GRADE, RADER],
  },
  {
    id: "ammonium-nitrate-34-0-0",
    name: "ammonium nitrate 34-0-0",
    chemistry: "ammonium nitrate",
    form: "solid",
    n: 34,
    p2o5: 0,
    k2o: 0,
    s: 0,
    lbPerGal: null,
    saltIndex: 104.7,
    containsUrea: false,
    containsThiosulfate: false,
    sources: [GRADE, RADER],
  },
];

/** The catalog product with this id, or undefined. */
export function findProduct(id: string): FertilizerProduct | undefined {
  return FERTILIZER_PRODUCTS.find((p) => p.id === id);
}
