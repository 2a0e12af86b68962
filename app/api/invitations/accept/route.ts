import { NextResponse } from "next/server";
import { acceptInvitation } from "@/db/queries/invitations";
import type { UnusableToken } from "@/db/queries/one-time-tokens";
import { invitationAcceptSchema } from "@/lib/auth/schemas";
import { handle, parseJson } from "@/lib/http";

const refusals: Record<UnusableToken, [number, string]> = {
  invalid: [404, "This invitation link is not valid. Check that you opened the whole link from the e-mail."],
  expired: [410, "This invitation link has expired. Ask your admin to send a new invitation."],
  used: [410, "This invitation link has already been used. Sign in with the password you chose."],
};

// Public: the link's token is the credential. Sets the password and activates the sign-in.
export const POST = handle("POST /api/invitations/accept", async (req) => {
  const body = await parseJson(req, invitationAcceptSchema);
  if (!body.ok) return body.response;
  const result = await acceptInvitation(body.data.token, body.data.password);
  if (!result.ok) {
    const [status, error] = refusals[result.reason];
    return NextResponse.json({ error, code: result.reason }, { status });
  }
  return NextResponse.json({ email: result.email, message: "Your password is set. You can sign in now." });
});
