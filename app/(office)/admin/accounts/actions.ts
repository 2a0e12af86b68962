"use server";

import { revalidatePath } from "next/cache";
import { getTranslations } from "next-intl/server";
import {
  type AccountMember,
  assignAccountMember,
  createAccount,
  unassignAccountMember,
  updateAccount,
} from "@/db/queries/admin-accounts";
import { findAccountAccess } from "@/db/queries/access";
import {
  type ActionResult,
  accountCreateSchema,
  accountMemberSchema,
  accountUpdateSchema,
  formValues,
  idSchema,
  invalidFields,
} from "@/lib/admin/schemas";
import { can } from "@/lib/auth/permissions";
import { getSessionUser } from "@/lib/auth/session";
import type { ZodError } from "zod";

type Translate = (key: string, values?: Record<string, string>) => string;

function invalid(t: Translate, error: ZodError, values: Record<string, string>) {
  return {
    error: t("errors.invalid"),
    fieldErrors: Object.fromEntries(invalidFields(error).map((f) => [f, [t(`fieldErrors.${f}`)]])),
    values,
  };
}

// May the signed-in user change this account? Admins may; a bad or unknown id is "not found" to them
// and "forbidden" to everyone else.
async function accountWriter(accountId: unknown): Promise<"ok" | "forbidden" | "not_found"> {
  const actor = await getSessionUser();
  if (!actor) return "forbidden";
  const id = idSchema.safeParse(accountId);
  const access = id.success ? await findAccountAccess(actor, id.data) : undefined;
  if (!access) return can(actor, "write", { kind: "region" }) ? "not_found" : "forbidden";
  return can(actor, "write", { kind: "account", access }) ? "ok" : "forbidden";
}

const GUARD_ERRORS = { forbidden: "errors.forbidden", not_found: "errors.accountNotFound" } as const;

export async function createAccountAction(
  _prev: unknown,
  form: FormData,
): Promise<ActionResult<{ id: string; name: string }>> {
  const t = await getTranslations("admin");
  const values = formValues(form);
  const actor = await getSessionUser();
  // A new account in a region: allowed to whoever may change accounts there.
  const access = {
    accountId: "",
    regionId: values.regionId ?? "",
    servedByActor: false,
    grownByActor: false,
  };
  if (!actor || !can(actor, "write", { kind: "account", access })) return { error: t("errors.forbidden") };
  const parsed = accountCreateSchema.safeParse(values);
  if (!parsed.success) return invalid(t, parsed.error, values);
  const result = await createAccount(parsed.data);
  if (!result.ok) {
    return {
      error: t("errors.regionNotFound"),
      fieldErrors: { regionId: [t("fieldErrors.regionId")] },
      values,
    };
  }
  revalidatePath("/admin", "layout");
  return { data: { id: result.account.id, name: result.account.name } };
}

export async function updateAccountAction(
  _prev: unknown,
  form: FormData,
): Promise<ActionResult<{ name: string }>> {
  const t = await getTranslations("admin");
  const values = formValues(form);
  const guard = await accountWriter(values.accountId);
  if (guard !== "ok") return { error: t(GUARD_ERRORS[guard]) };
  const parsed = accountUpdateSchema.safeParse(values);
  if (!parsed.success) return invalid(t, parsed.error, values);
  const { accountId, ...rest } = parsed.data;
  const result = await updateAccount(accountId, rest);
  if (!result.ok) {
    if (result.reason === "not_found") return { error: t("errors.accountNotFound") };
    return {
      error: t("errors.regionNotFound"),
      fieldErrors: { regionId: [t("fieldErrors.regionId")] },
      values,
    };
  }
  revalidatePath("/admin", "layout");
  return { data: { name: result.account.name } };
}

const MEMBER_ERRORS = {
  not_found: "errors.accountNotFound",
  user_not_found: "errors.userNotFound",
  wrong_role: "errors.memberWrongRole",
  wrong_region: "errors.memberWrongRegion",
  deactivated: "errors.memberDeactivated",
} as const;

export async function assignMemberAction(
  _prev: unknown,
  form: FormData,
): Promise<ActionResult<AccountMember>> {
  const t = await getTranslations("admin");
  const values = formValues(form);
  const guard = await accountWriter(values.accountId);
  if (guard !== "ok") return { error: t(GUARD_ERRORS[guard]) };
  const parsed = accountMemberSchema.safeParse(values);
  if (!parsed.success) return invalid(t, parsed.error, values);
  const result = await assignAccountMember(parsed.data.accountId, parsed.data.userId, parsed.data.kind);
  if (!result.ok) return { error: t(MEMBER_ERRORS[result.reason]) };
  revalidatePath("/admin", "layout");
  return { data: result.member };
}

export async function unassignMemberAction(
  _prev: unknown,
  form: FormData,
): Promise<ActionResult<{ id: string; name: string }>> {
  const t = await getTranslations("admin");
  const values = formValues(form);
  const guard = await accountWriter(values.accountId);
  if (guard !== "ok") return { error: t(GUARD_ERRORS[guard]) };
  const parsed = accountMemberSchema.safeParse(values);
  if (!parsed.success) return invalid(t, parsed.error, values);
  const removed = await unassignAccountMember(parsed.data.accountId, parsed.data.userId, parsed.data.kind);
  if (!removed) return { error: t("errors.memberNotOnAccount") };
  revalidatePath("/admin", "layout");
  return { data: removed };
}
