import { z } from "zod";
import { roleSchema } from "@/lib/auth/schemas";

// Shared by the admin screens' forms, their server actions and the /api/users and /api/regions
// handlers. Form values arrive as strings: an empty select means "none".

export const ADMIN_PAGE_SIZE = 25;
export const USER_STATUSES = ["invited", "active", "deactivated"] as const;
// An admin switches a user on or off; "invited" is only ever set by an invitation.
export const SETTABLE_STATUSES = ["active", "deactivated"] as const;
export const MEMBER_KINDS = ["rep", "grower"] as const;
export type MemberKind = (typeof MEMBER_KINDS)[number];

export const idSchema = z.uuid({ error: "Not a valid id." });

const emptyToNull = (v: unknown) => (v === "" ? null : v);
const emptyToUndefined = (v: unknown) => (v === "" ? undefined : v);

const nameSchema = (what: string, max: number) =>
  z
    .string({ error: `Enter a ${what}.` })
    .trim()
    .min(1, { error: `Enter a ${what}.` })
    .max(max, { error: `Use at most ${max} characters.` });

export const regionNameSchema = nameSchema("region name", 80);
export const accountNameSchema = nameSchema("account name", 120);
const localitySchema = z.preprocess(
  (v) => (typeof v === "string" && v.trim() === "" ? null : v),
  z.string().trim().max(120, { error: "Use at most 120 characters." }).nullable().default(null),
);

// ?q=&role=&regionId=&status=&page= on /admin/users and GET /api/users. regionId "none" means no region.
export const userFilterSchema = z.object({
  q: z.preprocess(
    emptyToUndefined,
    z.string().trim().max(100, { error: "Use at most 100 characters." }).optional(),
  ),
  role: z.preprocess(emptyToUndefined, roleSchema.optional()),
  regionId: z.preprocess(emptyToUndefined, z.union([idSchema, z.literal("none")]).optional()),
  status: z.preprocess(
    emptyToUndefined,
    z.enum(USER_STATUSES, { error: "Choose one of: invited, active, deactivated." }).optional(),
  ),
  page: z.preprocess(emptyToUndefined, z.coerce.number().int().min(1).max(100_000).default(1)),
});
export type UserFilter = z.infer<typeof userFilterSchema>;

// ?q=&regionId=&page= on /admin/accounts.
export const accountFilterSchema = z.object({
  q: userFilterSchema.shape.q,
  regionId: z.preprocess(emptyToUndefined, idSchema.optional()),
  page: userFilterSchema.shape.page,
});
export type AccountFilter = z.infer<typeof accountFilterSchema>;

// PATCH /api/users/[id]; unknown keys are refused so a typo never passes silently.
export const userUpdateSchema = z
  .strictObject({
    role: roleSchema.optional(),
    regionId: z.uuid({ error: "Choose a region." }).nullable().optional(),
    status: z.enum(SETTABLE_STATUSES, { error: "Choose one of: active, deactivated." }).optional(),
  })
  .refine((v) => v.role !== undefined || v.regionId !== undefined || v.status !== undefined, {
    error: "Send at least one of: role, regionId, status.",
  });
export type UserUpdate = z.infer<typeof userUpdateSchema>;

export const userRoleFormSchema = z.object({ userId: idSchema, role: roleSchema });
export const userRegionFormSchema = z.object({
  userId: idSchema,
  regionId: z.preprocess(emptyToNull, z.uuid({ error: "Choose a region." }).nullable()),
});
export const userStatusFormSchema = z.object({
  userId: idSchema,
  status: z.enum(SETTABLE_STATUSES, { error: "Choose one of: active, deactivated." }),
});

export const regionCreateSchema = z.object({ name: regionNameSchema });
export const regionRenameSchema = z.object({ regionId: idSchema, name: regionNameSchema });

export const accountCreateSchema = z.object({
  name: accountNameSchema,
  locality: localitySchema,
  regionId: z.uuid({ error: "Choose a region." }),
});
export const accountUpdateSchema = accountCreateSchema.extend({ accountId: idSchema });
export const accountMemberSchema = z.object({
  accountId: idSchema,
  userId: z.uuid({ error: "Choose a person." }),
  kind: z.enum(MEMBER_KINDS),
});

// What every admin server action returns (useActionState keeps the last one, null before the first).
// A failure carries back what was typed, as React resets a form after its action runs.
export type ActionResult<T = null> =
  | { data: T; error?: undefined; fieldErrors?: undefined; values?: undefined }
  | {
      data?: undefined;
      error: string;
      fieldErrors?: Record<string, string[]>;
      values?: Record<string, string>;
    };

// The names of the form fields a zod error points at, for messages shown beside each field.
export function invalidFields(error: z.ZodError): string[] {
  return [...new Set(error.issues.map((i) => String(i.path[0] ?? "")))].filter(Boolean);
}

// Reads searchParams leniently: a value that does not parse falls back to its default, so a stale or
// hand-edited link still shows a page.
export function parseSearchParams<T extends z.ZodObject>(
  schema: T,
  params: Record<string, string | string[] | undefined>,
): z.infer<T> {
  const raw: Record<string, unknown> = {};
  for (const key of Object.keys(schema.shape)) {
    const value = params[key];
    const first = Array.isArray(value) ? value[0] : value;
    const field = schema.shape[key] as z.ZodType;
    if (first !== undefined && field.safeParse(first).success) raw[key] = first;
  }
  return schema.parse(raw);
}

// FormData to a plain object of its string values (files are never sent by these forms).
export function formValues(form: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [key, value] of form.entries()) if (typeof value === "string") out[key] = value;
  return out;
}
