import "server-only";
import type { Actor } from "@/lib/auth/permissions";
import { db } from "../client";
import type { DugPlant, InjuryCase } from "../schema";
import { accountVisibleTo } from "./access";

// Everything the office shows about one dig, and the grower's answers to its recommendation.

export interface DigDetail {
  id: string;
  fieldId: string;
  fieldName: string;
  fieldBoundary: unknown;
  accountId: string;
  accountName: string;
  repId: string | null;
  repName: string | null;
  dugAt: Date;
  latitude: number | null;
  longitude: number | null;
  accuracyM: number | null;
  soilMoisture: "dry" | "moist" | "wet" | "saturated" | null;
  soilTempF: number | null;
  irrigatedYet: boolean;
  recommendation: string | null;
  flaggedByRep: boolean;
  notes: string | null;
  rootIndex: number | null;
  assessment: unknown;
  planting: {
    hybrid: string;
    plantedOn: string;
    seedingRate: number;
    seedingDepthIn: number;
    rowSpacingIn: number;
    soilTexture: string;
  } | null;
}

// A live dig by id with its field, account, rep and planting; whoever asks, callers check `can`.
export async function findDigDetail(id: string): Promise<DigDetail | undefined> {
  const row = await db
    .selectFrom("digSite")
    .innerJoin("field", "field.id", "digSite.fieldId")
    .innerJoin("account", "account.id", "digSite.accountId")
    .leftJoin("appUser", "appUser.id", "digSite.repId")
    .leftJoin("planting", (j) =>
      j.onRef("planting.id", "=", "digSite.plantingId").on("planting.deletedAt", "is", null),
    )
    .select([
      "digSite.id",
      "digSite.fieldId",
      "field.name as fieldName",
      "field.boundary as fieldBoundary",
      "digSite.accountId",
      "account.name as accountName",
      "digSite.repId",
      "appUser.name as repName",
      "digSite.dugAt",
      "digSite.latitude",
      "digSite.longitude",
      "digSite.accuracyM",
      "digSite.soilMoisture",
      "digSite.soilTempF",
      "digSite.irrigatedYet",
      "digSite.recommendation",
      "digSite.flaggedByRep",
      "digSite.notes",
      "digSite.rootIndex",
      "digSite.assessment",
      "planting.hybrid",
      "planting.plantedOn",
      "planting.seedingRate",
      "planting.seedingDepthIn",
      "planting.rowSpacingIn",
      "planting.soilTexture",
    ])
    .where("digSite.id", "=", id)
    .where("digSite.deletedAt", "is", null)
    .executeTakeFirst();
  if (!row) return undefined;
  const { hybrid, plantedOn, seedingRate, seedingDepthIn, rowSpacingIn, soilTexture, ...dig } = row;
  return {
    ...dig,
    repName: dig.repName ?? null,
    planting:
      hybrid != null && plantedOn != null
        ? {
            hybrid,
            plantedOn,
            seedingRate: seedingRate ?? 0,
            seedingDepthIn: seedingDepthIn ?? 0,
            rowSpacingIn: rowSpacingIn ?? 0,
            soilTexture: soilTexture ?? "medium",
          }
        : null,
  };
}

export async function listDigPlants(digSiteId: string): Promise<DugPlant[]> {
  return db
    .selectFrom("dugPlant")
    .selectAll()
    .where("digSiteId", "=", digSiteId)
    .where("deletedAt", "is", null)
    .orderBy("position")
    .orderBy("createdAt")
    .execute();
}

export interface DigPhoto {
  id: string;
  digSiteId: string;
  dugPlantId: string | null;
  sha256: string;
  contentType: string;
  width: number | null;
  height: number | null;
  caption: string | null;
  capturedAt: Date | null;
  objectKey: string;
  isIllustration: boolean;
}

// The confirmed, live photos of some digs (the record only points at bytes the server verified).
export async function listDigPhotos(digSiteIds: readonly string[]): Promise<DigPhoto[]> {
  if (digSiteIds.length === 0) return [];
  return db
    .selectFrom("photo")
    .select([
      "id",
      "digSiteId",
      "dugPlantId",
      "sha256",
      "contentType",
      "width",
      "height",
      "caption",
      "capturedAt",
      "objectKey",
      "isIllustration",
    ])
    .where("digSiteId", "in", digSiteIds)
    .where("deletedAt", "is", null)
    .where("confirmedAt", "is not", null)
    .orderBy("capturedAt")
    .orderBy("id")
    .execute();
}

export type DigCase = Pick<InjuryCase, "id" | "status" | "severity" | "sharedWithGrower">;

// The newest live case opened on the dig, if any.
export async function findDigCase(digSiteId: string): Promise<DigCase | undefined> {
  return db
    .selectFrom("injuryCase")
    .select(["id", "status", "severity", "sharedWithGrower"])
    .where("digSiteId", "=", digSiteId)
    .where("deletedAt", "is", null)
    .orderBy("createdAt", "desc")
    .executeTakeFirst();
}

export interface RecommendationResponseView {
  id: string;
  digSiteId: string;
  userId: string;
  userName: string;
  userRole: "rep" | "grower" | "supervisor" | "admin";
  kind: "acknowledged" | "comment";
  body: string | null;
  createdAt: Date;
}

export async function listRecommendationResponses(
  digSiteIds: readonly string[],
): Promise<RecommendationResponseView[]> {
  if (digSiteIds.length === 0) return [];
  return db
    .selectFrom("recommendationResponse")
    .innerJoin("appUser", "appUser.id", "recommendationResponse.userId")
    .select([
      "recommendationResponse.id",
      "recommendationResponse.digSiteId",
      "recommendationResponse.userId",
      "appUser.name as userName",
      "appUser.role as userRole",
      "recommendationResponse.kind",
      "recommendationResponse.body",
      "recommendationResponse.createdAt",
    ])
    .where("recommendationResponse.digSiteId", "in", digSiteIds)
    .orderBy("recommendationResponse.createdAt")
    .orderBy("recommendationResponse.id")
    .execute();
}

// Adds an acknowledgement or a comment. A second acknowledgement by the same user is not added:
// the existing one is returned (acknowledging twice means the same thing).
export async function createRecommendationResponse(input: {
  digSiteId: string;
  userId: string;
  kind: "acknowledged" | "comment";
  body: string | null;
}): Promise<{ id: string; created: boolean }> {
  return db.transaction().execute(async (trx) => {
    if (input.kind === "acknowledged") {
      // One acknowledgement per user and dig, even when two requests race.
      await trx
        .selectFrom("digSite")
        .select("id")
        .where("id", "=", input.digSiteId)
        .forUpdate()
        .executeTakeFirst();
      const existing = await trx
        .selectFrom("recommendationResponse")
        .select("id")
        .where("digSiteId", "=", input.digSiteId)
        .where("userId", "=", input.userId)
        .where("kind", "=", "acknowledged")
        .executeTakeFirst();
      if (existing) return { id: existing.id, created: false };
    }
    const row = await trx
      .insertInto("recommendationResponse")
      .values({
        digSiteId: input.digSiteId,
        userId: input.userId,
        kind: input.kind,
        body: input.kind === "comment" ? input.body : null,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    return { id: row.id, created: true };
  });
}

export interface GrowerRecommendation {
  digSiteId: string;
  dugAt: Date;
  fieldId: string;
  fieldName: string;
  repName: string | null;
  recommendation: string;
}

// The latest digs with a recommendation that the actor may read, newest first.
export async function listRecentRecommendations(
  actor: Actor,
  limit: number,
): Promise<GrowerRecommendation[]> {
  const rows = await db
    .selectFrom("digSite")
    .innerJoin("account", "account.id", "digSite.accountId")
    .innerJoin("field", "field.id", "digSite.fieldId")
    .leftJoin("appUser", "appUser.id", "digSite.repId")
    .select([
      "digSite.id as digSiteId",
      "digSite.dugAt",
      "digSite.fieldId",
      "field.name as fieldName",
      "appUser.name as repName",
      "digSite.recommendation",
    ])
    .where(accountVisibleTo(actor))
    .where("digSite.deletedAt", "is", null)
    .where("digSite.recommendation", "is not", null)
    .where("digSite.recommendation", "<>", "")
    .orderBy("digSite.dugAt", "desc")
    .orderBy("digSite.id")
    .limit(limit)
    .execute();
  return rows.map((r) => ({ ...r, repName: r.repName ?? null, recommendation: r.recommendation ?? "" }));
}
