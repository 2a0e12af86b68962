import { z } from "zod";

// What a grower (or the serving rep) sends about a dig's recommendation: an acknowledgement, or a
// comment. Shared by the dig page's form, its server action and the API route.

export const RESPONSE_BODY_MAX = 2000;

export const recommendationResponseCreateSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("acknowledged") }),
  z.object({
    kind: z.literal("comment"),
    body: z
      .string()
      .trim()
      .min(1, { error: "Write a comment first." })
      .max(RESPONSE_BODY_MAX, { error: `Keep the comment under ${RESPONSE_BODY_MAX} characters.` }),
  }),
]);
export type RecommendationResponseCreate = z.infer<typeof recommendationResponseCreateSchema>;
