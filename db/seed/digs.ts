import "server-only";
import type { Kysely } from "kysely";
import {
  addDays,
  assessDig,
  type DailyTemperature,
  type DigAssessment,
  dateForLeafStage,
  expectedNodalRoots,
  type FertilizerProduct,
  findProduct,
  type InjuryScore,
  type MesocotylCondition,
  nutrientsPerAcre,
  SEVERITIES,
  seedPlacedCheck,
  stageOnDate,
} from "@/lib/agronomy";
import { type AssessmentPlant, assessmentInputFor, assessmentPlantOf } from "@/lib/digs/assessment";
import type { Database, NewDigSite, NewDugPlant, NewPhoto } from "../schema";
import { DEMO_GRID_ORIGIN, type SeededField } from "./fields";
import { gridToLonLat, insideCorners } from "./geo";
import { createRandom, demoId, type Random, round, SEED_VERSION } from "./ids";
import {
  illustrationSvg,
  ILLUSTRATION_HEIGHT,
  ILLUSTRATION_WIDTH,
  uploadIllustration,
} from "./illustrations";
import type { SeededPass, SeededPlanting } from "./plantings";

/** What the rep found, which shapes the invented measurements and the advice. */
type Profile =
  | "healthy"
  | "seed_burn"
  | "shifted_burn"
  | "cold"
  | "disease"
  | "compaction"
  | "insect"
  | "shallow";

interface DemoDig {
  planting: string;
  /** Leaf collars the dig is timed for (V1–V6), from the season's GDD since planting. */
  collars: number;
  profile: Profile;
  photos: 0 | 1 | 2;
}

const dig = (planting: string, collars: number, profile: Profile, photos: 0 | 1 | 2 = 0): DemoDig => ({
  planting,
  collars,
  profile,
  photos,
});

export const DEMO_DIGS: readonly DemoDig[] = [
  dig("north-40", 1, "seed_burn", 2),
  dig("north-40", 2, "seed_burn", 1),
  dig("north-40", 3, "seed_burn", 1),
  dig("north-40", 5, "seed_burn"),
  dig("bench-80-west", 2, "healthy"),
  dig("bench-80-east", 2, "healthy"),
  dig("bench-80-west", 4, "healthy"),
  dig("bench-80-east", 4, "compaction", 1),
  dig("pivot-corner", 2, "healthy"),
  dig("pivot-corner", 4, "insect", 1),
  dig("pivot-corner", 6, "healthy"),
  dig("river-80", 1, "cold"),
  dig("river-80", 3, "disease", 1),
  dig("river-80", 5, "healthy"),
  dig("canal-strip-west", 3, "healthy"),
  dig("canal-strip-east", 3, "healthy"),
  dig("canal-strip-west", 5, "healthy"),
  dig("canal-strip-east", 5, "healthy"),
  dig("levee-60", 2, "healthy"),
  dig("levee-60", 4, "compaction"),
  dig("levee-60", 6, "healthy"),
  dig("barn-40", 2, "healthy"),
  dig("barn-40", 4, "healthy"),
  dig("barn-40", 6, "healthy"),
  dig("lagoon-quarter-west", 3, "healthy"),
  dig("lagoon-quarter-east", 3, "healthy"),
  dig("lagoon-quarter-west", 5, "disease"),
  dig("lagoon-quarter-east", 5, "healthy"),
  dig("south-canal-100", 2, "healthy"),
  dig("south-canal-100", 3, "healthy"),
  dig("south-canal-100", 5, "healthy"),
  dig("wash-road-80", 1, "shifted_burn", 2),
  dig("wash-road-80", 2, "shifted_burn", 1),
  dig("wash-road-80", 3, "shifted_burn", 1),
  dig("wash-road-80", 4, "shifted_burn"),
  dig("fan-top-40", 2, "healthy"),
  dig("fan-top-40", 4, "healthy"),
  dig("fan-top-40", 5, "insect"),
  dig("gravel-bar-20", 1, "shallow", 1),
  dig("gravel-bar-20", 3, "shallow"),
  dig("gravel-bar-20", 5, "shallow"),
];

interface PlantDraft {
  leafCollars: number;
  seedingDepthIn: number;
  crownDepthIn: number;
  mesocotyl: MesocotylCondition;
  seminalScore: number;
  nodalWhorls: number;
  nodalCount: number;
  longestNodalIn: number;
  seminalInjury: InjuryScore;
  nodalInjury: InjuryScore;
  findings: string[];
  band: { besideIn: number; belowIn: number } | null;
  notes: string | null;
}

export const stageName = (collars: number) => (collars === 0 ? "VE" : `V${collars}`);

const clamp = (x: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, x));

/** Invented measurements of one dug plant for a profile, scaled to what its stage should show. */
function draftPlant(
  r: Random,
  profile: Profile,
  siteCollars: number,
  planting: SeededPlanting,
  bandFound: "on_target" | "shifted" | null,
  affected: boolean,
): PlantDraft {
  const behind = profile === "seed_burn" || profile === "shifted_burn" || profile === "shallow" ? 0.3 : 0.15;
  const roll = r.next();
  const collars = clamp(siteCollars + (roll < behind ? -1 : roll > 0.88 ? 1 : 0), 0, 6);
  const expected = expectedNodalRoots(collars);
  const share = (lo: number, hi: number) => r.between(lo, hi);
  const plant: PlantDraft = {
    leafCollars: collars,
    seedingDepthIn: round(clamp(planting.seedingDepthIn + 0.12 * r.normal(), 1, 3), 2),
    crownDepthIn: round(r.between(0.55, 0.9), 2),
    mesocotyl: "healthy",
    seminalScore: r.int(4, 5),
    nodalWhorls: expected.whorls,
    nodalCount: Math.round(expected.roots * share(0.85, 1.15)),
    longestNodalIn: round(expected.longestIn * share(0.85, 1.1), 1),
    seminalInjury: "none",
    nodalInjury: "none",
    findings: [],
    band: null,
    notes: null,
  };
  const scaleNodal = (lo: number, hi: number) => {
    plant.nodalCount = Math.round(expected.roots * share(lo, hi));
    plant.longestNodalIn = round(expected.longestIn * share(lo, hi), 1);
    if (plant.nodalWhorls > 1 && r.next() < 0.4) plant.nodalWhorls -= 1;
  };

  if (affected) {
    switch (profile) {
      case "seed_burn":
        plant.seminalScore = r.int(1, 3);
        plant.seminalInjury = r.pick(["moderate", "severe"] as const);
        plant.mesocotyl = r.pick(["discolored", "damaged"] as const);
        plant.nodalInjury = r.pick(["slight", "moderate"] as const);
        scaleNodal(0.45, 0.75);
        plant.findings = ["band_burn"];
        plant.notes = "Seminal root tips brown and dry around the seed.";
        break;
      case "shifted_burn":
        plant.seminalScore = r.int(2, 4);
        plant.seminalInjury = r.pick(["slight", "moderate"] as const);
        plant.nodalInjury = r.pick(["slight", "moderate"] as const);
        scaleNodal(0.55, 0.85);
        plant.findings = ["band_burn"];
        plant.notes = "Roots on the band side pruned and brown.";
        break;
      case "cold":
        plant.mesocotyl = "discolored";
        plant.seminalScore = r.int(3, 4);
        plant.seminalInjury = "slight";
        scaleNodal(0.75, 0.95);
        plant.findings = ["cold_injury"];
        break;
      case "disease":
        plant.mesocotyl = "discolored";
        plant.seminalScore = 3;
        plant.seminalInjury = "slight";
        plant.findings = ["disease_lesion"];
        break;
      case "compaction":
        plant.nodalInjury = "slight";
        scaleNodal(0.6, 0.8);
        plant.findings = ["sidewall_compaction"];
        break;
      case "insect":
        plant.seminalScore = r.int(3, 4);
        plant.seminalInjury = r.pick(["slight", "moderate"] as const);
        plant.nodalInjury = "slight";
        scaleNodal(0.75, 0.9);
        plant.findings = ["insect_feeding"];
        break;
      case "shallow":
        plant.seedingDepthIn = round(r.between(0.8, 1.0), 2);
        plant.crownDepthIn = round(r.between(0.25, 0.45), 2);
        scaleNodal(0.6, 0.85);
        break;
      case "healthy":
        break;
    }
  }
  if (collars === 0) {
    plant.nodalWhorls = 0;
    plant.nodalCount = 0;
    plant.longestNodalIn = 0;
  }
  if (bandFound === "on_target") {
    plant.band = {
      besideIn: round(clamp(2 + 0.2 * r.normal(), 1.4, 2.6), 1),
      belowIn: round(clamp(2 + 0.25 * r.normal(), 1.3, 2.8), 1),
    };
  } else if (bandFound === "shifted") {
    plant.band = {
      besideIn: round(r.between(0.35, 0.65), 1),
      belowIn: round(clamp(2 + 0.2 * r.normal(), 1.5, 2.5), 1),
    };
  }
  return plant;
}

/** A drafted plant as the rep would record it (the dug_plant row's measurements). */
function recordedPlant(p: PlantDraft): AssessmentPlant {
  return assessmentPlantOf({
    ...p,
    leafStage: stageName(p.leafCollars),
    bandBesideIn: p.band?.besideIn ?? null,
    bandBelowIn: p.band?.belowIn ?? null,
  });
}

/**
 * The agronomy core's assessment of a dig, built as the phone and the server build it
 * (lib/digs/assessment.ts): the site's stage is the median of the plants' leaf stages; the passes are
 * the field's passes for this planting (or for the whole field) applied on or before the dig's day, each
 * banded pass audited with the mean band offsets measured on the plants; seeding depth is the plants' mean.
 */
export function assessDemoDig(
  plants: readonly PlantDraft[],
  passes: readonly { pass: SeededPass; product: FertilizerProduct }[],
  planting: SeededPlanting,
  dugAt: string,
): DigAssessment {
  const fieldId = planting.fieldRow.id;
  return assessDig(
    assessmentInputFor(
      { fieldId, plantingId: planting.id, dugAt },
      plants.map(recordedPlant),
      { id: planting.id, rowSpacingIn: planting.rowSpacingIn, soilTexture: planting.fieldRow.soil },
      passes.map(({ pass }) => ({
        fieldId,
        plantingId: pass.plantingId,
        productId: pass.productId,
        appliedOn: pass.appliedOn,
        rate: pass.rate,
        rateUnit: pass.rateUnit,
        placement: pass.placement,
        intendedBesideIn: pass.intendedBesideIn,
        intendedBelowIn: pass.intendedBelowIn,
      })),
      passes.map(({ pass, product }) => ({ ...product, id: pass.productId })),
    ),
  );
}

const mean = (xs: readonly number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;

function recommendation(
  profile: Profile,
  plants: readonly PlantDraft[],
  assessment: DigAssessment,
  planting: SeededPlanting,
  passes: readonly { pass: SeededPass; product: FertilizerProduct }[],
  firstIrrigationOn: string | null,
): string {
  const stage = stageName(assessment.leafCollars);
  const burnt = plants.filter((p) => p.findings.includes("band_burn")).length;
  const crown = round(mean(plants.map((p) => p.crownDepthIn)), 1);
  const soil = planting.fieldRow.soil === "coarse" ? "sandy" : planting.fieldRow.soil;
  switch (profile) {
    case "seed_burn": {
      const starter = passes.find((p) => p.pass.placement === "seed_placed");
      if (!starter) break;
      const n = nutrientsPerAcre(starter.product, starter.pass.rate, starter.pass.rateUnit);
      const limit = seedPlacedCheck({
        n: n.n,
        k2o: n.k2o,
        rowSpacingIn: planting.rowSpacingIn,
        soil: planting.fieldRow.soil,
      }).limitLbPerAcre;
      return (
        `Salt injury from the starter: ${starter.pass.rate} ${starter.pass.rateUnit} of ${starter.product.name} ` +
        `with the seed puts ${round(n.n + n.k2o, 1)} lb N + K2O per acre in the furrow, over the ${limit} lb/ac ` +
        `limit for ${soil} soil in ${planting.rowSpacingIn}-in rows. Burned root tips on ${burnt} of ${plants.length} ` +
        `plants. Count the stand in the thin spots before deciding on any replant; next season keep seed-placed ` +
        `N + K2O at ${limit} lb/ac or less here, or move the starter to a 2x2 band.`
      );
    }
    case "shifted_burn": {
      const band = passes.find((p) => p.pass.placement === "band_2x2");
      const beside = round(mean(plants.flatMap((p) => (p.band ? [p.band.besideIn] : []))), 1);
      return (
        `The 2x2 band was found about ${beside} in beside the row instead of the ${band?.pass.intendedBesideIn ?? 2} in ` +
        `it was set for, and roots facing it are burned on ${burnt} of ${plants.length} plants. Check opener ` +
        `alignment and wear on the planter before it goes to the next field, and count the stand in the affected rows.`
      );
    }
    case "cold":
      return (
        "Signs of cold stress after the cool spell that followed planting: some mesocotyls discoloured, roots " +
        "otherwise white and growing. No action; recheck in a week as the soil warms."
      );
    case "disease":
      return (
        "Brown lesions on some mesocotyls and seminal roots, usual in cool, wet soil. The stand is holding; " +
        "recheck after a warm week and note the drainage in this part of the field."
      );
    case "compaction":
      return (
        "Nodal roots run flat along the seed slot: sidewall compaction from planting into wet soil. Roots should " +
        "break out as the soil dries; note these spots and wait for drier soil before planting here next year."
      );
    case "insect":
      return (
        "Light feeding on seminal and first nodal roots of a few plants; the stand is not affected. Record it and " +
        "dig again in a week to see whether it spreads."
      );
    case "shallow": {
      const depth = mean(plants.map((p) => p.seedingDepthIn)).toFixed(1);
      return (
        `Seed found about ${depth} in deep against the ${planting.seedingDepthIn} in planned, with crowns near the ` +
        `surface (${crown} in): watch for rootless corn in hot, dry wind. Check depth settings and closing wheels ` +
        "before planting again, and keep the surface moist so nodal roots can set."
      );
    }
    case "healthy":
      break;
  }
  const next =
    assessment.leafCollars >= 6
      ? "Roots carry the plant from here; no further dig needed unless the stand changes."
      : firstIrrigationOn === null
        ? "Dig again in about a week."
        : "Dig again before the first irrigation.";
  const nearLimit = assessment.audit.some((f) => f.code === "seed_placed_near_limit")
    ? " The starter with the seed is close to the seed-safe limit for this soil; no injury seen, but do not raise it."
    : "";
  const strip = planting.strip
    ? " Dig the neighbouring hybrid strip on the same visit so the two compare fairly."
    : "";
  return (
    `Roots on track for ${stage}: seminal roots white and firm, nodal roots where expected, crown about ` +
    `${crown} in deep. No action needed. ${next}${nearLimit}${strip}`
  );
}

/** A point well inside the field (or its strip), in feet on the grid, chosen by the generator. */
function digPoint(r: Random, field: SeededField, strip: SeededPlanting["strip"]): [number, number] {
  const xs = field.cornersFt.map(([x]) => x);
  const ys = field.cornersFt.map(([, y]) => y);
  const [minX, maxX, minY, maxY] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
  const w = maxX - minX;
  const [from, to] = strip === "west" ? [0.08, 0.45] : strip === "east" ? [0.55, 0.92] : [0.08, 0.92];
  const margin = 80;
  for (let attempt = 0; attempt < 200; attempt++) {
    const x = minX + w * r.between(from, to);
    const y = minY + (maxY - minY) * r.between(0.08, 0.92);
    const corners = [
      [x - margin, y - margin],
      [x + margin, y - margin],
      [x + margin, y + margin],
      [x - margin, y + margin],
    ] as const;
    if (corners.every(([cx, cy]) => insideCorners(field.cornersFt, cx, cy))) return [x, y];
  }
  throw new Error(`Demo seed: no dig point found inside ${field.name}`);
}

function worstSeverity(assessment: DigAssessment): "caution" | "warning" | "critical" {
  const rank = Math.max(...assessment.flags.map((f) => SEVERITIES.indexOf(f.severity)), 1);
  return rank >= 3 ? "critical" : rank === 2 ? "warning" : "caution";
}

export interface SeededDigs {
  digs: number;
  plants: number;
  photos: number;
  cases: number;
}

/**
 * Inserts the demo digs with their dug plants, the assessment the server would compute, illustration
 * photos (uploaded to the bucket before their rows are written) and an injury case for each dig the
 * assessment sends for review.
 */
export async function seedDigs(
  db: Kysely<Database>,
  ctx: {
    plantings: readonly SeededPlanting[];
    passes: readonly SeededPass[];
    weather: readonly DailyTemperature[];
  },
): Promise<SeededDigs> {
  const r = createRandom(20260401);
  const plantingByKey = new Map(ctx.plantings.map((p) => [p.key, p]));
  const weatherByDay = new Map(ctx.weather.map((w) => [w.date, w]));
  const digRows: NewDigSite[] = [];
  const plantRows: NewDugPlant[] = [];
  const photoRows: NewPhoto[] = [];
  const uploads: Promise<unknown>[] = [];
  const cases: { digId: string; key: string; accountId: string; repId: string; assessment: DigAssessment }[] =
    [];

  for (const d of DEMO_DIGS) {
    const planting = plantingByKey.get(d.planting);
    if (!planting) throw new Error(`Demo dig: no planting ${d.planting}`);
    const field = planting.fieldRow;
    const key = `${d.planting}-v${d.collars}`;
    const digId = demoId("dig_site", key);

    const reached = dateForLeafStage(ctx.weather, planting.plantedOn, stageName(d.collars));
    if (!reached)
      throw new Error(`Demo dig ${key}: the season's weather never reaches ${stageName(d.collars)}`);
    let date = reached.date;
    const later = addDays(date, r.int(0, 2));
    if (stageOnDate(ctx.weather, planting.plantedOn, later).leafCollars === d.collars) date = later;
    const hour = r.int(8, 15);
    const dugAtLocal = `${date}T${String(hour).padStart(2, "0")}:${String(r.int(0, 59)).padStart(2, "0")}:00-07:00`;
    const dugAt = new Date(dugAtLocal);

    const passes = ctx.passes
      .filter(
        (p) =>
          p.field === field.key &&
          (p.planting === null || p.planting === planting.key) &&
          p.appliedOn <= date,
      )
      .map((pass) => {
        const product = findProduct(pass.product);
        if (!product) throw new Error(`Demo pass ${pass.key}: no catalog product ${pass.product}`);
        return { pass, product };
      });
    const bandPass = passes.find((p) => p.pass.placement === "band_2x2");
    const bandFound = bandPass ? (d.profile === "shifted_burn" ? "shifted" : "on_target") : null;

    const count = d.profile === "healthy" ? r.int(3, 4) : r.int(4, 5);
    const plants = Array.from({ length: count }, (_, i) =>
      // One plant of an affected dig is often spared, as in a real row.
      draftPlant(r, d.profile, d.collars, planting, bandFound, i < 3 || r.next() < 0.5),
    );
    const assessment = assessDemoDig(plants, passes, planting, dugAtLocal);
    const irrigatedYet = field.firstIrrigationOn !== null && field.firstIrrigationOn <= date;
    const weather = weatherByDay.get(date);
    const [xFt, yFt] = digPoint(r, field, planting.strip);
    const [lon, lat] = gridToLonLat(DEMO_GRID_ORIGIN, xFt, yFt);
    const burnSeen = plants.some((p) => p.findings.includes("band_burn"));
    const moisture = irrigatedYet
      ? "wet"
      : field.soil === "coarse"
        ? r.pick(["dry", "moist"] as const)
        : field.soil === "fine"
          ? r.pick(["moist", "wet"] as const)
          : "moist";
    const audit = { version: SEED_VERSION, createdBy: field.repId, updatedBy: field.repId };

    digRows.push({
      id: digId,
      fieldId: field.id,
      plantingId: planting.id,
      accountId: field.accountId,
      repId: field.repId,
      dugAt,
      latitude: lat,
      longitude: lon,
      accuracyM: round(r.between(2.5, 8), 1),
      soilMoisture: moisture,
      soilTempF: weather ? round((weather.maxF + weather.minF) / 2 + r.between(-1, 3), 1) : null,
      irrigatedYet,
      recommendation: recommendation(
        d.profile,
        plants,
        assessment,
        planting,
        passes,
        field.firstIrrigationOn,
      ),
      flaggedByRep: burnSeen,
      notes: null,
      rootIndex: assessment.siteIndex,
      assessment: JSON.stringify(assessment),
      ...audit,
    });
    const plantIds = plants.map((_, i) => demoId("dug_plant", `${key}-${i + 1}`));
    plants.forEach((p, i) => {
      plantRows.push({
        id: plantIds[i]!,
        digSiteId: digId,
        position: i + 1,
        ...recordedPlant(p),
        findings: [...p.findings],
        notes: p.notes,
        rootIndex: assessment.plants[i]?.index ?? null,
        ...audit,
      });
    });

    // Illustrate the plants with the lowest index first: the ones a reviewer wants to see.
    const order = plants
      .map((_, i) => i)
      .sort((a, b) => (assessment.plants[a]?.index ?? 0) - (assessment.plants[b]?.index ?? 0));
    for (const i of order.slice(0, d.photos)) {
      const p = plants[i]!;
      const svg = illustrationSvg(
        {
          leafCollars: p.leafCollars,
          seedingDepthIn: p.seedingDepthIn,
          crownDepthIn: p.crownDepthIn,
          mesocotyl: p.mesocotyl,
          seminalScore: p.seminalScore,
          nodalCount: p.nodalCount,
          longestNodalIn: p.longestNodalIn,
          burn: p.findings.includes("band_burn"),
          band: p.band,
        },
        {
          title: `${field.name} · ${planting.hybrid} · plant ${i + 1} at ${stageName(p.leafCollars)} · dug ${date}`,
          subtitle: "Drawn by the demo seed from the recorded measurements; not a photograph.",
        },
      );
      const photoId = demoId("photo", `${key}-${i + 1}`);
      uploads.push(
        uploadIllustration(svg).then((stored) => {
          photoRows.push({
            id: photoId,
            digSiteId: digId,
            dugPlantId: plantIds[i]!,
            ...stored,
            width: ILLUSTRATION_WIDTH,
            height: ILLUSTRATION_HEIGHT,
            caption: `Illustration of plant ${i + 1} (${stageName(p.leafCollars)})${p.findings.length ? `: ${p.findings.join(", ").replaceAll("_", " ")}` : ""}`,
            capturedAt: new Date(dugAt.getTime() + 10 * 60_000),
            confirmedAt: new Date(dugAt.getTime() + 4 * 3_600_000),
            isIllustration: true,
            ...audit,
          });
        }),
      );
    }

    if (assessment.flagForReview.flag) {
      cases.push({ digId, key, accountId: field.accountId, repId: field.repId, assessment });
    }
  }

  await db.insertInto("digSite").values(digRows).execute();
  await db.insertInto("dugPlant").values(plantRows).execute();
  // Every object is in the bucket before a row points at it.
  await Promise.all(uploads);
  photoRows.sort((a, b) => a.id.localeCompare(b.id));
  if (photoRows.length > 0) await db.insertInto("photo").values(photoRows).execute();

  for (const c of cases) {
    const caseId = demoId("injury_case", c.key);
    const severity = worstSeverity(c.assessment);
    await db
      .insertInto("injuryCase")
      .values({
        id: caseId,
        digSiteId: c.digId,
        accountId: c.accountId,
        status: "new",
        severity,
        version: SEED_VERSION,
        createdBy: c.repId,
        updatedBy: c.repId,
      })
      .execute();
    await db
      .insertInto("injuryCaseEvent")
      .values({
        caseId,
        actorId: c.repId,
        kind: "opened",
        body: c.assessment.flagForReview.reason,
        payload: JSON.stringify({
          severity,
          reasons: c.assessment.flagForReview.reasons,
          flags: c.assessment.flags.map((f) => f.code),
        }),
      })
      .execute();
  }
  return { digs: digRows.length, plants: plantRows.length, photos: photoRows.length, cases: cases.length };
}
