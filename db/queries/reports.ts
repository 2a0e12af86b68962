import "server-only";
import { sql } from "kysely";
import type { Actor } from "@/lib/auth/permissions";
import { db } from "../client";
import type { FieldReportStatus } from "../schema";
import { accountVisibleTo } from "./access";

// Reads behind the field report, its sending and the CSV exports. Callers check `can` first (a field
// or account the actor may not read is a 404); the list queries filter with accountVisibleTo.

export interface ReportField {
  id: string;
  name: string;
  accountId: string;
  accountName: string;
  regionId: string;
  areaAcres: number | null;
  irrigation: string;
  soilTexture: string;
  firstIrrigationOn: string | null;
  weatherStationId: string | null;
}

export async function findReportField(fieldId: string): Promise<ReportField | undefined> {
  return db
    .selectFrom("field")
    .innerJoin("account", "account.id", "field.accountId")
    .select([
      "field.id",
      "field.name",
      "field.accountId",
      "account.name as accountName",
      "account.regionId",
      "field.areaAcres",
      "field.irrigation",
      "field.soilTexture",
      "field.firstIrrigationOn",
      "field.weatherStationId",
    ])
    .where("field.id", "=", fieldId)
    .where("field.deletedAt", "is", null)
    .executeTakeFirst();
}

export async function listReportPlantings(fieldId: string) {
  return db
    .selectFrom("planting")
    .select(["id", "hybrid", "plantedOn", "seedingRate", "seedingDepthIn", "rowSpacingIn", "soilTexture"])
    .where("fieldId", "=", fieldId)
    .where("deletedAt", "is", null)
    .orderBy("plantedOn")
    .orderBy("hybrid")
    .execute();
}

export async function listReportPasses(fieldId: string) {
  return db
    .selectFrom("fertilizerPass")
    .innerJoin("product", "product.id", "fertilizerPass.productId")
    .select([
      "fertilizerPass.id",
      "fertilizerPass.plantingId",
      "fertilizerPass.appliedOn",
      "fertilizerPass.rate",
      "fertilizerPass.rateUnit",
      "fertilizerPass.placement",
      "fertilizerPass.intendedBesideIn",
      "fertilizerPass.intendedBelowIn",
      "product.name as productName",
      "product.gradeN as n",
      "product.gradeP2o5 as p2o5",
      "product.gradeK2o as k2o",
      "product.gradeS as s",
      "product.lbPerGal",
      "product.densitySource",
      "product.saltIndex",
      "product.saltIndexSource",
      "product.containsUrea",
      "product.containsThiosulfate",
    ])
    .where("fertilizerPass.fieldId", "=", fieldId)
    .where("fertilizerPass.deletedAt", "is", null)
    .orderBy("fertilizerPass.appliedOn")
    .orderBy("fertilizerPass.id")
    .execute();
}

export async function listReportDigs(fieldId: string) {
  return db
    .selectFrom("digSite")
    .leftJoin("appUser as rep", "rep.id", "digSite.repId")
    .leftJoin("planting", "planting.id", "digSite.plantingId")
    .select([
      "digSite.id",
      "digSite.plantingId",
      "digSite.dugAt",
      "digSite.rootIndex",
      "digSite.assessment",
      "digSite.flaggedByRep",
      "digSite.recommendation",
      "rep.name as repName",
      "planting.hybrid",
    ])
    .where("digSite.fieldId", "=", fieldId)
    .where("digSite.deletedAt", "is", null)
    .orderBy("digSite.dugAt")
    .orderBy("digSite.id")
    .execute();
}

export async function listReportPlants(fieldId: string) {
  return db
    .selectFrom("dugPlant")
    .innerJoin("digSite", "digSite.id", "dugPlant.digSiteId")
    .select([
      "dugPlant.digSiteId",
      "dugPlant.leafStage",
      "dugPlant.rootIndex",
      "dugPlant.bandBesideIn",
      "dugPlant.bandBelowIn",
    ])
    .where("digSite.fieldId", "=", fieldId)
    .where("digSite.deletedAt", "is", null)
    .where("dugPlant.deletedAt", "is", null)
    .orderBy("dugPlant.digSiteId")
    .orderBy("dugPlant.position")
    .execute();
}

// Photos of the field's live digs whose bytes are in the bucket (illustrations are always listed).
export async function listReportPhotos(fieldId: string) {
  return db
    .selectFrom("photo")
    .innerJoin("digSite", "digSite.id", "photo.digSiteId")
    .select([
      "photo.id",
      "photo.digSiteId",
      "photo.sha256",
      "photo.contentType",
      "photo.caption",
      "photo.objectKey",
      "photo.isIllustration",
      "digSite.dugAt",
    ])
    .where("digSite.fieldId", "=", fieldId)
    .where("digSite.deletedAt", "is", null)
    .where("photo.deletedAt", "is", null)
    .where((eb) => eb.or([eb("photo.confirmedAt", "is not", null), eb("photo.isIllustration", "=", true)]))
    .orderBy("digSite.dugAt")
    .orderBy("photo.createdAt")
    .execute();
}

export async function listStationWeather(stationId: string, fromDay: string) {
  return db
    .selectFrom("weatherDaily")
    .select(["day as date", "maxF", "minF"])
    .where("stationId", "=", stationId)
    .where("day", ">=", fromDay)
    .orderBy("day")
    .execute();
}

// E-mail addresses of the account's active growers.
export async function listAccountGrowerEmails(accountId: string): Promise<string[]> {
  const rows = await db
    .selectFrom("accountGrower")
    .innerJoin("appUser", "appUser.id", "accountGrower.userId")
    .select("appUser.email")
    .where("accountGrower.accountId", "=", accountId)
    .where("appUser.status", "=", "active")
    .orderBy("appUser.email")
    .execute();
  return rows.map((r) => r.email);
}

export interface NewFieldReportRow {
  id: string;
  fieldId: string;
  accountId: string;
  createdBy: string;
  objectKey: string;
  byteSize: number;
  sha256: string;
  recipients: string[];
}

export async function createFieldReport(row: NewFieldReportRow) {
  return db.insertInto("fieldReport").values(row).returningAll().executeTakeFirstOrThrow();
}

export async function setFieldReportStatus(
  id: string,
  status: FieldReportStatus,
  change: { error?: string | null; recipients?: string[] } = {},
) {
  return db
    .updateTable("fieldReport")
    .set({
      status,
      error: change.error ?? null,
      ...(change.recipients ? { recipients: change.recipients } : {}),
      ...(status === "sent" ? { sentAt: sql<Date>`now()` } : {}),
    })
    .where("id", "=", id)
    .returningAll()
    .executeTakeFirst();
}

export async function findFieldReport(id: string) {
  return db.selectFrom("fieldReport").selectAll().where("id", "=", id).executeTakeFirst();
}

export interface FieldReportListing {
  id: string;
  fieldId: string;
  fieldName: string;
  accountName: string;
  createdByName: string | null;
  recipients: string[];
  status: FieldReportStatus;
  error: string | null;
  byteSize: number;
  createdAt: Date;
  sentAt: Date | null;
}

// The reports of the accounts the actor may see (a grower: their own farm), newest first.
export async function listFieldReports(actor: Actor, limit = 200): Promise<FieldReportListing[]> {
  return db
    .selectFrom("fieldReport")
    .innerJoin("account", "account.id", "fieldReport.accountId")
    .innerJoin("field", "field.id", "fieldReport.fieldId")
    .leftJoin("appUser as author", "author.id", "fieldReport.createdBy")
    .select([
      "fieldReport.id",
      "fieldReport.fieldId",
      "field.name as fieldName",
      "account.name as accountName",
      "author.name as createdByName",
      "fieldReport.recipients",
      "fieldReport.status",
      "fieldReport.error",
      "fieldReport.byteSize",
      "fieldReport.createdAt",
      "fieldReport.sentAt",
    ])
    .where(accountVisibleTo(actor))
    .orderBy("fieldReport.createdAt", "desc")
    .orderBy("fieldReport.id")
    .limit(limit)
    .execute();
}

export type ExportScope = { fieldId: string } | { accountId: string };

// One row per live dig of the field or account, oldest first.
export async function listDigExportRows(scope: ExportScope) {
  let query = db
    .selectFrom("digSite")
    .innerJoin("field", "field.id", "digSite.fieldId")
    .innerJoin("account", "account.id", "digSite.accountId")
    .leftJoin("planting", "planting.id", "digSite.plantingId")
    .leftJoin("appUser as rep", "rep.id", "digSite.repId")
    .select((eb) => [
      "digSite.id",
      "account.name as accountName",
      "field.name as fieldName",
      "planting.hybrid",
      "planting.plantedOn",
      "digSite.dugAt",
      "rep.name as repName",
      "digSite.latitude",
      "digSite.longitude",
      "digSite.accuracyM",
      "digSite.soilMoisture",
      "digSite.soilTempF",
      "digSite.irrigatedYet",
      "digSite.rootIndex",
      "digSite.flaggedByRep",
      "digSite.recommendation",
      "digSite.notes",
      eb
        .selectFrom("dugPlant")
        .select((e) => e.fn.countAll<number>().as("n"))
        .whereRef("dugPlant.digSiteId", "=", "digSite.id")
        .where("dugPlant.deletedAt", "is", null)
        .as("plantCount"),
    ])
    .where("digSite.deletedAt", "is", null)
    .where("field.deletedAt", "is", null);
  query =
    "fieldId" in scope
      ? query.where("digSite.fieldId", "=", scope.fieldId)
      : query.where("digSite.accountId", "=", scope.accountId);
  return query.orderBy("digSite.dugAt").orderBy("digSite.id").execute();
}

// One row per live dug plant of the field's or account's live digs, with its dig's columns.
export async function listPlantExportRows(scope: ExportScope) {
  let query = db
    .selectFrom("dugPlant")
    .innerJoin("digSite", "digSite.id", "dugPlant.digSiteId")
    .innerJoin("field", "field.id", "digSite.fieldId")
    .innerJoin("account", "account.id", "digSite.accountId")
    .leftJoin("planting", "planting.id", "digSite.plantingId")
    .leftJoin("appUser as rep", "rep.id", "digSite.repId")
    .select([
      "digSite.id as digId",
      "account.name as accountName",
      "field.name as fieldName",
      "planting.hybrid",
      "planting.plantedOn",
      "digSite.dugAt",
      "rep.name as repName",
      "digSite.latitude",
      "digSite.longitude",
      "digSite.rootIndex as digRootIndex",
      "digSite.flaggedByRep",
      "dugPlant.id",
      "dugPlant.position",
      "dugPlant.leafStage",
      "dugPlant.seedingDepthIn",
      "dugPlant.crownDepthIn",
      "dugPlant.mesocotyl",
      "dugPlant.seminalScore",
      "dugPlant.nodalWhorls",
      "dugPlant.nodalCount",
      "dugPlant.longestNodalIn",
      "dugPlant.seminalInjury",
      "dugPlant.nodalInjury",
      "dugPlant.findings",
      "dugPlant.bandBesideIn",
      "dugPlant.bandBelowIn",
      "dugPlant.rootIndex",
      "dugPlant.notes",
    ])
    .where("dugPlant.deletedAt", "is", null)
    .where("digSite.deletedAt", "is", null)
    .where("field.deletedAt", "is", null);
  query =
    "fieldId" in scope
      ? query.where("digSite.fieldId", "=", scope.fieldId)
      : query.where("digSite.accountId", "=", scope.accountId);
  return query
    .orderBy("digSite.dugAt")
    .orderBy("digSite.id")
    .orderBy("dugPlant.position")
    .orderBy("dugPlant.id")
    .execute();
}

// One report with its field's and account's names, whoever asks; callers check `can` on the field.
export async function findFieldReportListing(id: string) {
  return db
    .selectFrom("fieldReport")
    .innerJoin("account", "account.id", "fieldReport.accountId")
    .innerJoin("field", "field.id", "fieldReport.fieldId")
    .select([
      "fieldReport.id",
      "fieldReport.fieldId",
      "fieldReport.accountId",
      "fieldReport.objectKey",
      "fieldReport.status",
      "fieldReport.createdAt",
      "field.name as fieldName",
      "account.name as accountName",
    ])
    .where("fieldReport.id", "=", id)
    .executeTakeFirst();
}
