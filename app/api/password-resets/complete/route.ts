import { NextResponse } from "next/server";
import type { UnusableToken } from "@/db/queries/one-time-tokens";
import { completePasswordReset } from "@/db/queries/password-resets";
import { passwordResetCompleteSchema } from "@/lib/auth/schemas";
import { handle, parseJson } from "@/lib/http";

const refusals: Record<UnusableToken, [number, string]> = {
  invalid: [404, "This reset link is not valid. Check that you opened the whole link from the e-mail."],
  expired: [410, "This reset link has expired. Ask for a new one."],
  used: [410, "This reset link has already been used. Sign in, or ask for a new link."],
};

// Public: the link's token is the credential. Replaces the password of an active sign-in.
export const POST = handle("POST /api/password-resets/complete", async (req) => {
  const body = await parseJson(req, passwordResetCompleteSchema);
  if (!body.ok) return body.response;
  const result = await completePasswordReset(body.data.token, body.data.password);
  if (!result.ok) {
    const [status, error] = refusals[result.reason];
    return NextResponse.json({ error, code: result.reason }, { status });
  }
  return NextResponse.json({
    email: result.email,
    message: "Your password has been changed. Sign in with the new one.",
  });
});
