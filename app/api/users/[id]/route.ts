import { NextResponse } from "next/server";
import { findAdminUser, updateUser } from "@/db/queries/admin-users";
import { idSchema, userUpdateSchema } from "@/lib/admin/schemas";
import { can, refusalStatus } from "@/lib/auth/permissions";
import { authenticate, forbidden, handle, jsonError, notFoundJson, parseJson } from "@/lib/http";

type Ctx = { params: Promise<{ id: string }> };

const REFUSALS = {
  self_deactivate: "You cannot deactivate your own sign-in. Ask another admin.",
  self_demote: "You cannot remove your own admin role. Ask another admin.",
} as const;

// Admins change a user's role, region or status.
export const PATCH = handle<Ctx>("PATCH /api/users/[id]", async (req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const id = idSchema.safeParse((await ctx.params).id);
  if (!id.success) return notFoundJson("user");
  const target = await findAdminUser(id.data);
  if (!target) return notFoundJson("user");
  const resource = { kind: "user", regionId: target.regionId } as const;
  if (!can(auth.user, "write", resource)) {
    // A supervisor is not told about another region's users; roles without the user admin at all get 403.
    const hidden = auth.user.role === "supervisor" && refusalStatus(auth.user, resource) === 404;
    return hidden ? notFoundJson("user") : forbidden();
  }

  const body = await parseJson(req, userUpdateSchema);
  if (!body.ok) return body.response;
  const result = await updateUser(auth.user, id.data, body.data);
  if (!result.ok) {
    switch (result.reason) {
      case "not_found":
        return notFoundJson("user");
      case "region_not_found":
        return jsonError(422, "Some values are not valid.", [
          { path: "regionId", message: "No such region." },
        ]);
      default:
        return jsonError(422, REFUSALS[result.reason]);
    }
  }
  return NextResponse.json({ user: result.user, stillAssigned: result.stillAssigned });
});
