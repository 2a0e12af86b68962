import { after, NextResponse } from "next/server";
import { requestPasswordReset } from "@/db/queries/password-resets";
import { passwordResetRequestSchema } from "@/lib/auth/schemas";
import { env } from "@/lib/env";
import { handle, parseJson } from "@/lib/http";
import { passwordResetMail } from "@/lib/mail/templates";
import { sendMail } from "@/lib/mail/transport";

// Public. Answers the same 202 whether or not the address has a sign-in, and sends the e-mail after
// the response, so neither the body nor the timing tells which addresses exist.
export const POST = handle("POST /api/password-resets", async (req) => {
  const body = await parseJson(req, passwordResetRequestSchema);
  if (!body.ok) return body.response;
  const reset = await requestPasswordReset(body.data.email);
  if (reset) {
    after(async () => {
      try {
        await sendMail(
          await passwordResetMail({
            to: reset.email,
            name: reset.name,
            token: reset.token,
            ttlMinutes: env.RESET_TTL_MINUTES,
          }),
        );
      } catch (err) {
        console.error("[mail] a password reset e-mail could not be sent:", err);
      }
    });
  }
  return NextResponse.json(
    {
      message: `If that address has a Trenchbook sign-in, a reset link has been sent. It works once and expires in ${env.RESET_TTL_MINUTES} minutes.`,
    },
    { status: 202 },
  );
});
