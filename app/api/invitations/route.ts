import { NextResponse } from "next/server";
import { type InvitationRefusal, inviteUser } from "@/db/queries/invitations";
import { invitationCreateSchema } from "@/lib/auth/schemas";
import { authenticate, forbidden, handle, jsonError, parseJson } from "@/lib/http";

const refusals: Record<Exclude<InvitationRefusal, "forbidden">, [number, string]> = {
  activeUser: [409, "This e-mail address already has an active sign-in."],
  deactivatedUser: [
    409,
    "This e-mail address belongs to a deactivated sign-in. Restore it instead of inviting.",
  ],
  unknownRegion: [422, "That region does not exist."],
  unknownAccounts: [422, "Some accounts do not exist or are not in the chosen region."],
  busy: [409, "This address was invited a moment ago by someone else. Check the users list."],
};

// Admin only: creates the invited sign-in (or renews an unanswered invitation) and e-mails the link.
export const POST = handle("POST /api/invitations", async (req) => {
  const auth = await authenticate(["admin"]);
  if (!auth.ok) return auth.response;
  const body = await parseJson(req, invitationCreateSchema);
  if (!body.ok) return body.response;

  const result = await inviteUser(auth.user, body.data, auth.user.name);
  if (!result.ok) {
    if (result.reason === "forbidden") return forbidden();
    const [status, message] = refusals[result.reason];
    return jsonError(status, message);
  }
  const { invitation } = result;
  if (!result.mailSent) {
    return NextResponse.json(
      {
        error: `The invitation for ${invitation.email} was saved, but the e-mail could not be sent. Send the invitation again to retry.`,
        invitation,
      },
      { status: 502 },
    );
  }
  return NextResponse.json({ invitation }, { status: invitation.reinvited ? 200 : 201 });
});
