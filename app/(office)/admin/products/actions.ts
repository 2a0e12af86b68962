"use server";

import { revalidatePath } from "next/cache";
import { getTranslations } from "next-intl/server";
import { createProduct } from "@/db/queries/products";
import { type ActionResult, formValues } from "@/lib/admin/schemas";
import { can } from "@/lib/auth/permissions";
import { getSessionUser } from "@/lib/auth/session";
import { productCreateSchema } from "@/lib/records/schemas";

const NUMBER_FIELDS = ["gradeN", "gradeP2o5", "gradeK2o", "gradeS", "lbPerGal", "saltIndex"] as const;
const TEXT_OR_NULL = ["densitySource", "saltIndexSource"] as const;

// Form strings → the shape the catalog schema (shared with POST /api/products) takes.
function toProductInput(values: Record<string, string>) {
  const input: Record<string, unknown> = {
    name: values.name ?? "",
    chemistry: values.chemistry ?? "",
    form: values.form ?? "",
    containsUrea: values.containsUrea === "on",
    containsThiosulfate: values.containsThiosulfate === "on",
  };
  for (const key of NUMBER_FIELDS) {
    const raw = (values[key] ?? "").trim().replace(",", ".");
    input[key] = raw === "" ? (key === "gradeS" ? 0 : null) : Number(raw);
  }
  for (const key of TEXT_OR_NULL) {
    const raw = (values[key] ?? "").trim();
    input[key] = raw === "" ? null : raw;
  }
  return input;
}

export async function createProductAction(
  _prev: unknown,
  form: FormData,
): Promise<ActionResult<{ name: string }>> {
  const t = await getTranslations("products");
  const actor = await getSessionUser();
  if (!actor || !can(actor, "write", { kind: "product" })) return { error: t("errors.forbidden") };
  const values = formValues(form);
  const parsed = productCreateSchema.safeParse(toProductInput(values));
  if (!parsed.success) {
    const fieldErrors: Record<string, string[]> = {};
    for (const issue of parsed.error.issues) {
      const key = String(issue.path[0] ?? "form");
      fieldErrors[key] = [...(fieldErrors[key] ?? []), issue.message];
    }
    return { error: t("errors.invalid"), fieldErrors, values };
  }
  const created = await createProduct(parsed.data);
  if (!created) {
    return {
      error: t("errors.duplicate", { name: parsed.data.name }),
      fieldErrors: { name: [t("errors.taken")] },
      values,
    };
  }
  revalidatePath("/admin/products");
  revalidatePath("/field/calculator");
  return { data: { name: created.name } };
}
