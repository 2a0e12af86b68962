import "server-only";
import { cache } from "react";
import { findAccountAccess } from "@/db/queries/access";
import { findFieldDetail } from "@/db/queries/fields";
import { can } from "@/lib/auth/permissions";
import { requirePageUser } from "@/lib/auth/session";
import { isRecordId } from "@/lib/records/schemas";

/**
 * The field as the signed-in user may see it, once per request: null for a bad id, another farm's
 * field or a deleted one (the pages answer 404), else the field and whether the user may change it.
 */
export const loadField = cache(async (fieldId: string) => {
  const user = await requirePageUser();
  if (!isRecordId(fieldId)) return null;
  const field = await findFieldDetail(fieldId);
  const access = field && (await findAccountAccess(user, field.accountId));
  if (!field || !access || !can(user, "read", { kind: "field", access })) return null;
  return { user, field, canEdit: can(user, "write", { kind: "field", access }) };
});
