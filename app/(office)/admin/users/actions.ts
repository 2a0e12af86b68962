"use server";

import { revalidatePath } from "next/cache";
import { getTranslations } from "next-intl/server";
import { type AccountRef, updateUser } from "@/db/queries/admin-users";
import {
  type ActionResult,
  formValues,
  invalidFields,
  type UserUpdate,
  userRegionFormSchema,
  userRoleFormSchema,
  userStatusFormSchema,
} from "@/lib/admin/schemas";
import { can } from "@/lib/auth/permissions";
import { getSessionUser } from "@/lib/auth/session";
import type { z } from "zod";

export interface UserChange {
  name: string;
  stillAssigned: { rep: AccountRef[]; grower: AccountRef[] };
}

// Every change to a user goes through here: re-check that the caller manages users, validate, write
// through db/queries/admin-users.ts (the same path as PATCH /api/users/[id]).
async function change<S extends z.ZodType<{ userId: string }>>(
  schema: S,
  form: FormData,
  toPatch: (v: z.infer<S>) => UserUpdate,
): Promise<ActionResult<UserChange>> {
  const t = await getTranslations("admin");
  const actor = await getSessionUser();
  if (!actor || !can(actor, "write", { kind: "user", regionId: null }))
    return { error: t("errors.forbidden") };
  const parsed = schema.safeParse(formValues(form));
  if (!parsed.success) {
    const fields = invalidFields(parsed.error);
    return {
      error: t("errors.invalid"),
      fieldErrors: Object.fromEntries(fields.map((f) => [f, [t(`fieldErrors.${f}`)]])),
    };
  }
  const result = await updateUser(actor, parsed.data.userId, toPatch(parsed.data));
  if (!result.ok) {
    const key = {
      not_found: "errors.userNotFound",
      region_not_found: "errors.regionNotFound",
      self_deactivate: "errors.selfDeactivate",
      self_demote: "errors.selfDemote",
    } as const;
    return { error: t(key[result.reason]) };
  }
  revalidatePath("/admin", "layout");
  return { data: { name: result.user.name, stillAssigned: result.stillAssigned } };
}

export async function changeUserRole(_prev: unknown, form: FormData): Promise<ActionResult<UserChange>> {
  return change(userRoleFormSchema, form, (v) => ({ role: v.role }));
}

export async function changeUserRegion(_prev: unknown, form: FormData): Promise<ActionResult<UserChange>> {
  return change(userRegionFormSchema, form, (v) => ({ regionId: v.regionId }));
}

export async function changeUserStatus(_prev: unknown, form: FormData): Promise<ActionResult<UserChange>> {
  return change(userStatusFormSchema, form, (v) => ({ status: v.status }));
}
