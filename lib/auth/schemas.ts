import { z } from "zod";
import type { Role } from "@/db/schema";
import { MIN_PASSWORD_LENGTH } from "./password";

// Shared by the sign-in, invitation and reset forms and their route handlers.
export const ROLES = ["rep", "grower", "supervisor", "admin"] as const;

export const emailSchema = z
  .string({ error: "Enter an e-mail address." })
  .trim()
  .toLowerCase()
  .max(254, { error: "That e-mail address is too long." })
  .pipe(z.email({ error: "Enter a valid e-mail address, like name@example.com." }));

export const passwordSchema = z
  .string({ error: "Enter a password." })
  .min(MIN_PASSWORD_LENGTH, { error: `Use at least ${MIN_PASSWORD_LENGTH} characters.` })
  .max(200, { error: "Use at most 200 characters." });

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, { error: "Enter your password." }).max(200),
});

export const roleSchema = z.enum(ROLES, { error: "Choose one of: rep, grower, supervisor, admin." });

// Regional roles need a region; only reps and growers are attached to accounts.
export const ROLES_WITH_REGION: readonly Role[] = ["rep", "grower", "supervisor"];
export const ROLES_WITH_ACCOUNTS: readonly Role[] = ["rep", "grower"];

export const invitationCreateSchema = z
  .object({
    email: emailSchema,
    name: z
      .string({ error: "Enter the person's name." })
      .trim()
      .min(1, { error: "Enter the person's name." })
      .max(120, { error: "Use at most 120 characters." }),
    role: roleSchema,
    regionId: z.uuid({ error: "Choose a region." }).nullable().optional(),
    accountIds: z
      .array(z.uuid({ error: "Choose accounts from the list." }))
      .max(200, { error: "Choose at most 200 accounts." })
      .optional(),
  })
  .superRefine((v, ctx) => {
    if (ROLES_WITH_REGION.includes(v.role) && !v.regionId) {
      ctx.addIssue({ code: "custom", path: ["regionId"], message: "Choose a region for this role." });
    }
    if (v.accountIds?.length && !ROLES_WITH_ACCOUNTS.includes(v.role)) {
      ctx.addIssue({
        code: "custom",
        path: ["accountIds"],
        message: "Only field reps and growers are attached to accounts.",
      });
    }
  });

export type InvitationCreate = z.infer<typeof invitationCreateSchema>;

export const tokenSchema = z.string().regex(/^[A-Za-z0-9_-]{32,128}$/, { error: "This link is not valid." });

export const invitationAcceptSchema = z.object({
  token: tokenSchema,
  password: passwordSchema,
});

export const passwordResetRequestSchema = z.object({ email: emailSchema });

export const passwordResetCompleteSchema = z.object({
  token: tokenSchema,
  password: passwordSchema,
});
