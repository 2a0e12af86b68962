"use server";

import { revalidatePath } from "next/cache";
import { getTranslations } from "next-intl/server";
import type { ZodError } from "zod";
import { findAccountAccess } from "@/db/queries/access";
import {
  createFertilizerPass,
  findFertilizerPass,
  updateFertilizerPass,
} from "@/db/queries/fertilizer-passes";
import { findField, updateFieldBoundary } from "@/db/queries/fields";
import { createPlanting, findPlanting, updatePlanting } from "@/db/queries/plantings";
import { findActiveProduct } from "@/db/queries/products";
import type { Field } from "@/db/schema";
import { type ActionResult, formValues, invalidFields } from "@/lib/admin/schemas";
import { type AccountAccess, can } from "@/lib/auth/permissions";
import { getSessionUser, type SessionUser } from "@/lib/auth/session";
import {
  type BoundaryError,
  type BoundaryImport,
  boundaryOfGeometry,
  importBoundary,
  MAX_BOUNDARY_ACRES,
  MAX_BOUNDARY_POSITIONS,
} from "@/lib/geo/import";
import {
  fertilizerPassCreateSchema,
  isRecordId,
  PLACEMENTS,
  plantingCreateSchema,
} from "@/lib/records/schemas";

// The field page's writes. Each re-checks the session and `can(…, "write", field)`, validates with
// the record schemas the API routes use, and writes through the versioned queries so every change
// takes the region's next sync version and reaches the phones on their next pull.

type Translate = Awaited<ReturnType<typeof getTranslations<"fieldPage">>>;

interface Writer {
  actor: SessionUser;
  field: Field;
  access: AccountAccess;
}

async function fieldWriter(
  fieldId: unknown,
  t: Translate,
): Promise<{ ok: true; writer: Writer } | { ok: false; error: string }> {
  const actor = await getSessionUser();
  if (!actor) return { ok: false, error: t("errors.signedOut") };
  const field = typeof fieldId === "string" && isRecordId(fieldId) ? await findField(fieldId) : undefined;
  const access = field && (await findAccountAccess(actor, field.accountId));
  if (!field || !access || !can(actor, "read", { kind: "field", access })) {
    return { ok: false, error: t("errors.fieldNotFound") };
  }
  if (!can(actor, "write", { kind: "field", access })) return { ok: false, error: t("errors.forbidden") };
  return { ok: true, writer: { actor, field, access } };
}

function invalid(t: Translate, error: ZodError, values: Record<string, string>) {
  return {
    error: t("errors.invalid"),
    fieldErrors: Object.fromEntries(
      invalidFields(error).map((f) => [
        f,
        [t.has(`fieldErrors.${f}`) ? t(`fieldErrors.${f}` as "fieldErrors.hybrid") : error.message],
      ]),
    ),
    values,
  };
}

// A form's number: empty is null (the schema says whether that is allowed), anything else a number.
const numberOrNull = (v: string | undefined) => (v === undefined || v.trim() === "" ? null : Number(v));
const textOrNull = (v: string | undefined) => (v === undefined ? null : v);

function refreshField(fieldId: string) {
  revalidatePath(`/fields/${fieldId}`);
}

export async function savePlantingAction(
  _prev: unknown,
  form: FormData,
): Promise<ActionResult<{ id: string; hybrid: string }>> {
  const t = await getTranslations("fieldPage");
  const values = formValues(form);
  const guard = await fieldWriter(values.fieldId, t);
  if (!guard.ok) return { error: guard.error };
  const { field, access, actor } = guard.writer;
  const parsed = plantingCreateSchema.safeParse({
    hybrid: values.hybrid ?? "",
    plantedOn: values.plantedOn ?? "",
    seedingRate: numberOrNull(values.seedingRate),
    seedingDepthIn: numberOrNull(values.seedingDepthIn),
    rowSpacingIn: numberOrNull(values.rowSpacingIn),
    soilTexture: values.soilTexture,
    notes: textOrNull(values.notes),
  });
  if (!parsed.success) return invalid(t, parsed.error, values);
  const change = { regionId: access.regionId, actorId: actor.id };
  const plantingId = values.plantingId;
  let saved: { id: string; hybrid: string } | undefined;
  if (plantingId) {
    const current = isRecordId(plantingId) ? await findPlanting(plantingId) : undefined;
    if (!current || current.fieldId !== field.id) return { error: t("errors.plantingNotFound") };
    saved = await updatePlanting(plantingId, parsed.data, change);
  } else {
    saved = await createPlanting(field, parsed.data, change);
  }
  if (!saved) return { error: t("errors.plantingNotFound") };
  refreshField(field.id);
  return { data: { id: saved.id, hybrid: saved.hybrid } };
}

export async function savePassAction(_prev: unknown, form: FormData): Promise<ActionResult<{ id: string }>> {
  const t = await getTranslations("fieldPage");
  const values = formValues(form);
  const guard = await fieldWriter(values.fieldId, t);
  if (!guard.ok) return { error: guard.error };
  const { field, access, actor } = guard.writer;
  const placement = values.placement ?? "";
  const banded = placement === "band_2x2" || placement === "side_dress";
  const parsed = fertilizerPassCreateSchema.safeParse({
    productId: values.productId ?? "",
    appliedOn: values.appliedOn ?? "",
    rate: numberOrNull(values.rate),
    rateUnit: values.rateUnit,
    placement: (PLACEMENTS as readonly string[]).includes(placement) ? placement : placement || undefined,
    // Offsets describe a band; a seed-placed or broadcast pass has none.
    intendedBesideIn: banded ? numberOrNull(values.intendedBesideIn) : null,
    intendedBelowIn: banded ? numberOrNull(values.intendedBelowIn) : null,
    notes: textOrNull(values.notes),
    plantingId: values.plantingId ? values.plantingId : null,
  });
  if (!parsed.success) return invalid(t, parsed.error, values);
  const fieldErrors: Record<string, string[]> = {};
  if (!(await findActiveProduct(parsed.data.productId))) fieldErrors.productId = [t("fieldErrors.productId")];
  if (parsed.data.plantingId) {
    const planting = await findPlanting(parsed.data.plantingId);
    if (!planting || planting.fieldId !== field.id) fieldErrors.plantingId = [t("fieldErrors.plantingId")];
  }
  if (Object.keys(fieldErrors).length > 0) return { error: t("errors.invalid"), fieldErrors, values };
  const change = { regionId: access.regionId, actorId: actor.id };
  const passId = values.passId;
  let saved: { id: string } | undefined;
  if (passId) {
    const current = isRecordId(passId) ? await findFertilizerPass(passId) : undefined;
    if (!current || current.fieldId !== field.id) return { error: t("errors.passNotFound") };
    // The pass keeps its planting; the record routes do not move a pass between plantings either.
    const { plantingId: _kept, ...patch } = parsed.data;
    saved = await updateFertilizerPass(passId, patch, change);
  } else {
    saved = await createFertilizerPass(field, parsed.data, change);
  }
  if (!saved) return { error: t("errors.passNotFound") };
  refreshField(field.id);
  return { data: { id: saved.id } };
}

export interface BoundaryResult {
  data?: { areaAcres: number; areaHectares: number };
  error?: string;
  /** The reasons a file or drawing was refused, translated. */
  problems?: string[];
}

function boundaryProblems(t: Translate, errors: BoundaryError[]): string[] {
  return errors.map((e) => {
    const key = `boundary.errors.${e.code}` as "boundary.errors.empty";
    if (!t.has(key)) return e.message;
    const ring = e.values.ring;
    return t(key, {
      ...e.values,
      ring: ring === undefined ? "" : ring === 0 ? t("boundary.outerRing") : t("boundary.hole", { n: ring }),
      found: e.values.found ?? t("boundary.nothing"),
      max: MAX_BOUNDARY_POSITIONS,
      maxAcres: MAX_BOUNDARY_ACRES,
    });
  });
}

async function saveBoundary(fieldId: unknown, result: (t: Translate) => BoundaryImport | string) {
  const t = await getTranslations("fieldPage");
  const guard = await fieldWriter(fieldId, t);
  if (!guard.ok) return { error: guard.error };
  const { field, access, actor } = guard.writer;
  const parsed = result(t);
  if (typeof parsed === "string") return { error: parsed };
  if (!parsed.ok) return { error: t("boundary.refused"), problems: boundaryProblems(t, parsed.errors) };
  const saved = await updateFieldBoundary(field.id, parsed.boundary, {
    regionId: access.regionId,
    actorId: actor.id,
  });
  if (!saved) return { error: t("errors.fieldNotFound") };
  refreshField(field.id);
  return { data: { areaAcres: parsed.boundary.areaAcres, areaHectares: parsed.boundary.areaHectares } };
}

/** Largest boundary file the page accepts, bytes. */
const MAX_FILE_BYTES = 1024 * 1024;

export async function importBoundaryAction(_prev: unknown, form: FormData): Promise<BoundaryResult> {
  const file = form.get("file");
  const fieldId = form.get("fieldId");
  const chosen = form.get("format");
  const text =
    file instanceof File && file.size > 0 && file.size <= MAX_FILE_BYTES ? await file.text() : null;
  return saveBoundary(fieldId, (t) => {
    if (!(file instanceof File) || file.size === 0) return t("boundary.noFile");
    if (text === null) return t("boundary.tooBig");
    const name = file.name.toLowerCase();
    const format =
      chosen === "kml" || chosen === "geojson"
        ? chosen
        : name.endsWith(".kml") || text.trimStart().startsWith("<")
          ? "kml"
          : "geojson";
    return importBoundary(format, text);
  });
}

export async function saveDrawnBoundaryAction(fieldId: string, geometry: unknown): Promise<BoundaryResult> {
  return saveBoundary(fieldId, () => boundaryOfGeometry(geometry));
}
