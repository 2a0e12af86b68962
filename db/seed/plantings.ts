import "server-only";
import type { Kysely } from "kysely";
import type { Database, Placement } from "../schema";
import type { SeededField } from "./fields";
import { demoId, SEED_VERSION } from "./ids";

export interface DemoPlanting {
  key: string;
  field: string;
  hybrid: string;
  plantedOn: string;
  /** Seeds per acre. */
  seedingRate: number;
  seedingDepthIn: number;
  rowSpacingIn: number;
  /** Side-by-side hybrid strips: which half of the field this hybrid is in. */
  strip: "west" | "east" | null;
  notes: string | null;
}

const STRIPS = "Side-by-side hybrid strips, 12 rows each, repeated across the field for comparison.";

export const DEMO_PLANTINGS: readonly DemoPlanting[] = [
  {
    key: "north-40",
    field: "north-40",
    hybrid: "TB-0970",
    plantedOn: "2026-04-06",
    seedingRate: 34_000,
    seedingDepthIn: 1.75,
    rowSpacingIn: 30,
    strip: null,
    notes: null,
  },
  {
    key: "bench-80-west",
    field: "bench-80",
    hybrid: "TB-1140",
    plantedOn: "2026-04-09",
    seedingRate: 34_000,
    seedingDepthIn: 2,
    rowSpacingIn: 30,
    strip: "west",
    notes: STRIPS,
  },
  {
    key: "bench-80-east",
    field: "bench-80",
    hybrid: "TB-1185",
    plantedOn: "2026-04-09",
    seedingRate: 34_000,
    seedingDepthIn: 2,
    rowSpacingIn: 30,
    strip: "east",
    notes: STRIPS,
  },
  {
    key: "pivot-corner",
    field: "pivot-corner",
    hybrid: "TB-1185",
    plantedOn: "2026-04-03",
    seedingRate: 33_000,
    seedingDepthIn: 1.75,
    rowSpacingIn: 30,
    strip: null,
    notes: null,
  },
  {
    key: "river-80",
    field: "river-80",
    hybrid: "TB-1140",
    plantedOn: "2026-04-14",
    seedingRate: 32_000,
    seedingDepthIn: 1.5,
    rowSpacingIn: 30,
    strip: null,
    notes: "Heavy ground: planted shallower and at a lower rate.",
  },
  {
    key: "canal-strip-west",
    field: "canal-strip",
    hybrid: "TB-0970",
    plantedOn: "2026-04-16",
    seedingRate: 35_000,
    seedingDepthIn: 2,
    rowSpacingIn: 30,
    strip: "west",
    notes: STRIPS,
  },
  {
    key: "canal-strip-east",
    field: "canal-strip",
    hybrid: "TB-1140",
    plantedOn: "2026-04-16",
    seedingRate: 35_000,
    seedingDepthIn: 2,
    rowSpacingIn: 30,
    strip: "east",
    notes: STRIPS,
  },
  {
    key: "levee-60",
    field: "levee-60",
    hybrid: "TB-1185",
    plantedOn: "2026-04-21",
    seedingRate: 34_000,
    seedingDepthIn: 2,
    rowSpacingIn: 30,
    strip: null,
    notes: null,
  },
  {
    key: "barn-40",
    field: "barn-40",
    hybrid: "TB-1260",
    plantedOn: "2026-04-10",
    seedingRate: 36_000,
    seedingDepthIn: 1.75,
    rowSpacingIn: 40,
    strip: null,
    notes: "Silage for the dairy; 40-in rows to match the chopper head.",
  },
  {
    key: "lagoon-quarter-west",
    field: "lagoon-quarter",
    hybrid: "TB-1185",
    plantedOn: "2026-04-13",
    seedingRate: 35_000,
    seedingDepthIn: 1.75,
    rowSpacingIn: 30,
    strip: "west",
    notes: `Silage. ${STRIPS}`,
  },
  {
    key: "lagoon-quarter-east",
    field: "lagoon-quarter",
    hybrid: "TB-1260",
    plantedOn: "2026-04-13",
    seedingRate: 35_000,
    seedingDepthIn: 1.75,
    rowSpacingIn: 30,
    strip: "east",
    notes: `Silage. ${STRIPS}`,
  },
  {
    key: "south-canal-100",
    field: "south-canal-100",
    hybrid: "TB-1140",
    plantedOn: "2026-04-17",
    seedingRate: 34_000,
    seedingDepthIn: 2,
    rowSpacingIn: 30,
    strip: null,
    notes: null,
  },
  {
    key: "wash-road-80",
    field: "wash-road-80",
    hybrid: "TB-1140",
    plantedOn: "2026-04-08",
    seedingRate: 33_000,
    seedingDepthIn: 2,
    rowSpacingIn: 30,
    strip: null,
    notes: null,
  },
  {
    key: "fan-top-40",
    field: "fan-top-40",
    hybrid: "TB-0970",
    plantedOn: "2026-04-24",
    seedingRate: 36_000,
    seedingDepthIn: 2.25,
    rowSpacingIn: 20,
    strip: null,
    notes: "20-in rows on drip tape.",
  },
  {
    key: "gravel-bar-20",
    field: "gravel-bar-20",
    hybrid: "TB-1185",
    plantedOn: "2026-04-27",
    seedingRate: 30_000,
    seedingDepthIn: 1.5,
    rowSpacingIn: 30,
    strip: null,
    notes: null,
  },
];

export interface DemoPass {
  key: string;
  field: string;
  /** The planting the pass belongs to; null for a pass over the whole field (pre-plant, or every strip). */
  planting: string | null;
  /** Catalog id in FERTILIZER_PRODUCTS. */
  product: string;
  appliedOn: string;
  rate: number;
  rateUnit: "lb/ac" | "gal/ac";
  placement: Placement;
  intendedBesideIn: number | null;
  intendedBelowIn: number | null;
  notes: string | null;
}

const APP = "ammonium-polyphosphate-10-34-0";

export const DEMO_PASSES: readonly DemoPass[] = [
  // Over the seed-safe limit: 7 gal/ac of 10-34-0 with the seed on sandy ground in 30-in rows.
  {
    key: "north-40-starter",
    field: "north-40",
    planting: "north-40",
    product: APP,
    appliedOn: "2026-04-06",
    rate: 7,
    rateUnit: "gal/ac",
    placement: "seed_placed",
    intendedBesideIn: null,
    intendedBelowIn: null,
    notes: "Starter through the seed tubes; rate raised this year.",
  },
  {
    key: "north-40-side-dress",
    field: "north-40",
    planting: "north-40",
    product: "uan-32",
    appliedOn: "2026-06-02",
    rate: 30,
    rateUnit: "gal/ac",
    placement: "side_dress",
    intendedBesideIn: 10,
    intendedBelowIn: 3,
    notes: null,
  },
  {
    key: "bench-80-2x2",
    field: "bench-80",
    planting: null,
    product: APP,
    appliedOn: "2026-04-09",
    rate: 10,
    rateUnit: "gal/ac",
    placement: "band_2x2",
    intendedBesideIn: 2,
    intendedBelowIn: 2,
    notes: null,
  },
  {
    key: "pivot-corner-preplant",
    field: "pivot-corner",
    planting: null,
    product: "urea-46-0-0",
    appliedOn: "2026-03-25",
    rate: 160,
    rateUnit: "lb/ac",
    placement: "broadcast",
    intendedBesideIn: null,
    intendedBelowIn: null,
    notes: "Incorporated before listing beds.",
  },
  {
    key: "pivot-corner-starter",
    field: "pivot-corner",
    planting: "pivot-corner",
    product: APP,
    appliedOn: "2026-04-03",
    rate: 3,
    rateUnit: "gal/ac",
    placement: "seed_placed",
    intendedBesideIn: null,
    intendedBelowIn: null,
    notes: null,
  },
  {
    key: "river-80-preplant",
    field: "river-80",
    planting: null,
    product: "ammonium-sulfate-21-0-0-24s",
    appliedOn: "2026-03-30",
    rate: 150,
    rateUnit: "lb/ac",
    placement: "broadcast",
    intendedBesideIn: null,
    intendedBelowIn: null,
    notes: null,
  },
  {
    key: "river-80-2x2",
    field: "river-80",
    planting: "river-80",
    product: APP,
    appliedOn: "2026-04-14",
    rate: 8,
    rateUnit: "gal/ac",
    placement: "band_2x2",
    intendedBesideIn: 2,
    intendedBelowIn: 2,
    notes: null,
  },
  {
    key: "canal-strip-2x2",
    field: "canal-strip",
    planting: null,
    product: APP,
    appliedOn: "2026-04-16",
    rate: 10,
    rateUnit: "gal/ac",
    placement: "band_2x2",
    intendedBesideIn: 2,
    intendedBelowIn: 2,
    notes: null,
  },
  {
    key: "levee-60-starter",
    field: "levee-60",
    planting: "levee-60",
    product: APP,
    appliedOn: "2026-04-21",
    rate: 4,
    rateUnit: "gal/ac",
    placement: "seed_placed",
    intendedBesideIn: null,
    intendedBelowIn: null,
    notes: null,
  },
  {
    key: "levee-60-side-dress",
    field: "levee-60",
    planting: "levee-60",
    product: "uan-32",
    appliedOn: "2026-06-10",
    rate: 35,
    rateUnit: "gal/ac",
    placement: "side_dress",
    intendedBesideIn: 8,
    intendedBelowIn: 3,
    notes: null,
  },
  {
    key: "barn-40-potash",
    field: "barn-40",
    planting: null,
    product: "potassium-chloride-0-0-60",
    appliedOn: "2026-03-28",
    rate: 120,
    rateUnit: "lb/ac",
    placement: "broadcast",
    intendedBesideIn: null,
    intendedBelowIn: null,
    notes: null,
  },
  {
    key: "barn-40-2x2",
    field: "barn-40",
    planting: "barn-40",
    product: APP,
    appliedOn: "2026-04-10",
    rate: 12,
    rateUnit: "gal/ac",
    placement: "band_2x2",
    intendedBesideIn: 2,
    intendedBelowIn: 2,
    notes: null,
  },
  {
    key: "lagoon-quarter-starter",
    field: "lagoon-quarter",
    planting: null,
    product: APP,
    appliedOn: "2026-04-13",
    rate: 5,
    rateUnit: "gal/ac",
    placement: "seed_placed",
    intendedBesideIn: null,
    intendedBelowIn: null,
    notes: null,
  },
  // Close to the limit (at least 80 % of it) but within it: a caution, no injury seen.
  {
    key: "south-canal-100-starter",
    field: "south-canal-100",
    planting: "south-canal-100",
    product: APP,
    appliedOn: "2026-04-17",
    rate: 6,
    rateUnit: "gal/ac",
    placement: "seed_placed",
    intendedBesideIn: null,
    intendedBelowIn: null,
    notes: null,
  },
  // The shifted band: set up 2 in beside and 2 in below; the digs find it about 1/2 in beside the row.
  {
    key: "wash-road-80-2x2",
    field: "wash-road-80",
    planting: "wash-road-80",
    product: "uan-32",
    appliedOn: "2026-04-08",
    rate: 10,
    rateUnit: "gal/ac",
    placement: "band_2x2",
    intendedBesideIn: 2,
    intendedBelowIn: 2,
    notes: "Borrowed planter; openers not checked before planting.",
  },
  {
    key: "fan-top-40-starter",
    field: "fan-top-40",
    planting: "fan-top-40",
    product: APP,
    appliedOn: "2026-04-24",
    rate: 3,
    rateUnit: "gal/ac",
    placement: "seed_placed",
    intendedBesideIn: null,
    intendedBelowIn: null,
    notes: null,
  },
  {
    key: "gravel-bar-20-2x2",
    field: "gravel-bar-20",
    planting: "gravel-bar-20",
    product: APP,
    appliedOn: "2026-04-27",
    rate: 8,
    rateUnit: "gal/ac",
    placement: "band_2x2",
    intendedBesideIn: 2,
    intendedBelowIn: 2,
    notes: null,
  },
];

export interface SeededPlanting extends DemoPlanting {
  id: string;
  fieldRow: SeededField;
}

export interface SeededPass extends DemoPass {
  id: string;
  productId: string;
  plantingId: string | null;
}

/** Inserts the demo plantings and fertilizer passes. */
export async function seedPlantingsAndPasses(
  db: Kysely<Database>,
  fields: readonly SeededField[],
  productIds: ReadonlyMap<string, string>,
): Promise<{ plantings: SeededPlanting[]; passes: SeededPass[] }> {
  const fieldByKey = new Map(fields.map((f) => [f.key, f]));
  const fieldOf = (key: string) => {
    const f = fieldByKey.get(key);
    if (!f) throw new Error(`Demo seed: no field ${key}`);
    return f;
  };
  const plantings = DEMO_PLANTINGS.map(
    (p): SeededPlanting => ({ ...p, id: demoId("planting", p.key), fieldRow: fieldOf(p.field) }),
  );
  await db
    .insertInto("planting")
    .values(
      plantings.map((p) => ({
        id: p.id,
        fieldId: p.fieldRow.id,
        accountId: p.fieldRow.accountId,
        hybrid: p.hybrid,
        plantedOn: p.plantedOn,
        seedingRate: p.seedingRate,
        seedingDepthIn: p.seedingDepthIn,
        rowSpacingIn: p.rowSpacingIn,
        soilTexture: p.fieldRow.soil,
        notes: p.notes,
        version: SEED_VERSION,
        createdBy: p.fieldRow.repId,
        updatedBy: p.fieldRow.repId,
      })),
    )
    .execute();

  const passes = DEMO_PASSES.map((p): SeededPass => {
    const productId = productIds.get(p.product);
    if (!productId) throw new Error(`Demo pass ${p.key}: no product ${p.product} in the catalog`);
    return {
      ...p,
      id: demoId("fertilizer_pass", p.key),
      productId,
      plantingId: p.planting && demoId("planting", p.planting),
    };
  });
  await db
    .insertInto("fertilizerPass")
    .values(
      passes.map((p) => {
        const field = fieldOf(p.field);
        return {
          id: p.id,
          fieldId: field.id,
          plantingId: p.plantingId,
          accountId: field.accountId,
          productId: p.productId,
          appliedOn: p.appliedOn,
          rate: p.rate,
          rateUnit: p.rateUnit,
          placement: p.placement,
          intendedBesideIn: p.intendedBesideIn,
          intendedBelowIn: p.intendedBelowIn,
          notes: p.notes,
          version: SEED_VERSION,
          createdBy: field.repId,
          updatedBy: field.repId,
        };
      }),
    )
    .execute();
  return { plantings, passes };
}
