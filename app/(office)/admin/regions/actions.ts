"use server";

import { revalidatePath } from "next/cache";
import { getTranslations } from "next-intl/server";
import { createRegion, type RegionOption, renameRegion } from "@/db/queries/regions";
import {
  type ActionResult,
  formValues,
  invalidFields,
  regionCreateSchema,
  regionRenameSchema,
} from "@/lib/admin/schemas";
import { can } from "@/lib/auth/permissions";
import { getSessionUser } from "@/lib/auth/session";

async function mayWriteRegions(): Promise<boolean> {
  const actor = await getSessionUser();
  return Boolean(actor && can(actor, "write", { kind: "region" }));
}

export async function createRegionAction(
  _prev: unknown,
  form: FormData,
): Promise<ActionResult<RegionOption>> {
  const t = await getTranslations("admin");
  if (!(await mayWriteRegions())) return { error: t("errors.forbidden") };
  const values = formValues(form);
  const parsed = regionCreateSchema.safeParse(values);
  if (!parsed.success) {
    return { error: t("errors.invalid"), fieldErrors: { name: [t("fieldErrors.regionName")] }, values };
  }
  const result = await createRegion(parsed.data.name);
  if (!result.ok) {
    const error = t("errors.regionDuplicate", { name: parsed.data.name });
    return { error, fieldErrors: { name: [t("fieldErrors.regionTaken")] }, values };
  }
  revalidatePath("/admin", "layout");
  return { data: result.region };
}

export async function renameRegionAction(
  _prev: unknown,
  form: FormData,
): Promise<ActionResult<RegionOption>> {
  const t = await getTranslations("admin");
  if (!(await mayWriteRegions())) return { error: t("errors.forbidden") };
  const values = formValues(form);
  const parsed = regionRenameSchema.safeParse(values);
  if (!parsed.success) {
    if (invalidFields(parsed.error).includes("regionId")) return { error: t("errors.regionNotFound") };
    return { error: t("errors.invalid"), fieldErrors: { name: [t("fieldErrors.regionName")] }, values };
  }
  const result = await renameRegion(parsed.data.regionId, parsed.data.name);
  if (!result.ok) {
    if (result.reason === "not_found") return { error: t("errors.regionNotFound") };
    const error = t("errors.regionDuplicate", { name: parsed.data.name });
    return { error, fieldErrors: { name: [t("fieldErrors.regionTaken")] }, values };
  }
  revalidatePath("/admin", "layout");
  return { data: result.region };
}
