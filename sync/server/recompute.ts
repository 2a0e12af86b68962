import "server-only";
import { sql } from "kysely";
import { assessDig, type DigAssessment, SEVERITIES } from "@/lib/agronomy";
import {
  type AssessmentPlant,
  assessmentInputFor,
  assessmentPlantOf,
  missingMeasurements,
} from "@/lib/digs/assessment";
import type { Trx } from "./merge";

// The server's own numbers for a dig (issue 5): the placement audit, root index and injury flags are
// recomputed from the SERVER's rows of the site, its live plants, its planting, the field's live
// fertilizer passes and the catalog, through the same lib/digs/assessment mapping the phone and the
// demo seed use. A device's numbers are never stored.
//
// The dig's day is the UTC date of the stored dug_at (the column keeps the instant, not the device's
// offset), so a dig recorded late in the evening may audit passes of one more day than the phone's
// own summary did; the stored assessment is the one every device receives.

export interface Recomputed {
  // An injury case opened by this call (none when the dig already had one or needs none).
  openedCaseId: string | null;
}

// Sorts keys so two JSON values compare equal whatever order jsonb gave their keys.
function canonical(value: unknown): string {
  return JSON.stringify(value, (_key, v) =>
    v && typeof v === "object" && !Array.isArray(v)
      ? Object.fromEntries(
          Object.entries(v as Record<string, unknown>).sort(([a], [b]) => a.localeCompare(b)),
        )
      : v,
  );
}

function caseSeverity(assessment: DigAssessment | null): "caution" | "warning" | "critical" {
  const rank = Math.max(1, ...(assessment?.flags ?? []).map((f) => SEVERITIES.indexOf(f.severity)));
  return rank >= 3 ? "critical" : rank === 2 ? "warning" : "caution";
}

/**
 * Recomputes and stores root_index (site and each live plant) and the assessment of one live dig,
 * at `version` of the dig's region (taken by the caller inside this transaction); rows whose numbers
 * do not change are not written. When the assessment sends the dig for review, or the rep flagged it,
 * opens exactly one injury case for it with its 'opened' event: idempotent (the case is unique per
 * dig; a retry or a later recompute finds it and opens nothing). Returns the case it opened, for the
 * supervisor notice that follows the commit.
 */
export async function recomputeDig(
  trx: Trx,
  digSiteId: string,
  version: number,
  actorId: string,
): Promise<Recomputed> {
  const site = await trx
    .selectFrom("digSite")
    .selectAll()
    .where("id", "=", digSiteId)
    .where("deletedAt", "is", null)
    .executeTakeFirst();
  if (!site) return { openedCaseId: null };
  const plants = await trx
    .selectFrom("dugPlant")
    .selectAll()
    .where("digSiteId", "=", digSiteId)
    .where("deletedAt", "is", null)
    .orderBy("position")
    .orderBy("createdAt")
    .orderBy("id")
    .execute();
  const planting = site.plantingId
    ? await trx
        .selectFrom("planting")
        .select(["id", "rowSpacingIn", "soilTexture"])
        .where("id", "=", site.plantingId)
        .executeTakeFirst()
    : undefined;
  const passes = await trx
    .selectFrom("fertilizerPass")
    .select([
      "fieldId",
      "plantingId",
      "productId",
      "appliedOn",
      "rate",
      "rateUnit",
      "placement",
      "intendedBesideIn",
      "intendedBelowIn",
    ])
    .where("fieldId", "=", site.fieldId)
    .where("deletedAt", "is", null)
    .orderBy("appliedOn")
    .orderBy("id")
    .execute();
  const productIds = [...new Set(passes.map((p) => p.productId))];
  const products =
    productIds.length === 0
      ? []
      : await trx
          .selectFrom("product")
          .select([
            "id",
            "name",
            "gradeN as n",
            "gradeP2o5 as p2o5",
            "gradeK2o as k2o",
            "gradeS as s",
            "lbPerGal",
            "saltIndex",
            "containsUrea",
            "containsThiosulfate",
          ])
          .where("id", "in", productIds)
          .execute();

  const recorded: AssessmentPlant[] = plants.map(assessmentPlantOf);
  let assessment: DigAssessment | null = null;
  if (recorded.some((p) => missingMeasurements(p).length === 0)) {
    try {
      assessment = assessDig(
        assessmentInputFor(
          { fieldId: site.fieldId, plantingId: site.plantingId, dugAt: site.dugAt.toISOString() },
          recorded,
          planting ?? null,
          passes,
          products,
        ),
      );
    } catch (err) {
      // An entry the agronomy core refuses leaves the dig without an assessment, as on the phone.
      if (!(err instanceof RangeError)) throw err;
    }
  }

  const rootIndex = assessment?.siteIndex ?? null;
  if (rootIndex !== site.rootIndex || canonical(assessment) !== canonical(site.assessment)) {
    await trx
      .updateTable("digSite")
      .set({
        rootIndex,
        assessment: assessment === null ? null : JSON.stringify(assessment),
        version,
        fieldVersions: sql`field_versions || ${JSON.stringify({ rootIndex: version, assessment: version })}::jsonb`,
        updatedAt: sql`now()`,
      })
      .where("id", "=", digSiteId)
      .execute();
  }
  // The core scores the plants with every root measurement, in order.
  let scored = 0;
  for (let i = 0; i < plants.length; i++) {
    const plant = plants[i]!;
    const index =
      assessment && missingMeasurements(recorded[i]!).length === 0
        ? (assessment.plants[scored++]?.index ?? null)
        : null;
    if (index === plant.rootIndex) continue;
    await trx
      .updateTable("dugPlant")
      .set({
        rootIndex: index,
        version,
        fieldVersions: sql`field_versions || ${JSON.stringify({ rootIndex: version })}::jsonb`,
        updatedAt: sql`now()`,
      })
      .where("id", "=", plant.id)
      .execute();
  }

  if (!(assessment?.flagForReview.flag || site.flaggedByRep)) return { openedCaseId: null };
  const severity = caseSeverity(assessment);
  const opened = await trx
    .insertInto("injuryCase")
    .values({
      digSiteId,
      accountId: site.accountId,
      severity,
      version,
      createdBy: actorId,
      updatedBy: actorId,
    })
    .onConflict((oc) => oc.column("digSiteId").doNothing())
    .returning("id")
    .executeTakeFirst();
  if (!opened) return { openedCaseId: null };
  const reasons = [
    ...(assessment?.flagForReview.flag ? assessment.flagForReview.reasons : []),
    ...(site.flaggedByRep ? ["Flagged for review by the rep."] : []),
  ];
  await trx
    .insertInto("injuryCaseEvent")
    .values({
      caseId: opened.id,
      actorId,
      kind: "opened",
      body: reasons.join(" "),
      payload: JSON.stringify({
        severity,
        reasons,
        flags: assessment?.flags.map((f) => f.code) ?? [],
        flaggedByRep: site.flaggedByRep,
        siteIndex: assessment?.siteIndex ?? null,
      }),
    })
    .execute();
  return { openedCaseId: opened.id };
}
