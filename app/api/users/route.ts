import { NextResponse } from "next/server";
import { listUsers } from "@/db/queries/admin-users";
import { userFilterSchema } from "@/lib/admin/schemas";
import { can } from "@/lib/auth/permissions";
import { authenticate, forbidden, handle, jsonError, zodIssues } from "@/lib/http";

const API_PAGE_SIZE = 100;

// Admins list everyone; a supervisor lists the users of their own region; anyone else is refused.
export const GET = handle("GET /api/users", async (req) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const actor = auth.user;
  // Whoever may manage users may list all of them.
  const everyone = can(actor, "write", { kind: "user", regionId: null });
  if (!everyone && !(actor.regionId && can(actor, "read", { kind: "user", regionId: actor.regionId }))) {
    return forbidden();
  }
  const params = Object.fromEntries(new URL(req.url).searchParams);
  const filter = userFilterSchema.safeParse(params);
  if (!filter.success) return jsonError(422, "Some filters are not valid.", zodIssues(filter.error));
  const { page, ...rest } = filter.data;
  // A supervisor asking for another region, or for users with none, gets their own region's users.
  const regionId = everyone ? rest.regionId : actor.regionId!;
  const { users, total } = await listUsers({ ...rest, regionId, page, pageSize: API_PAGE_SIZE });
  // Account assignments may name accounts outside a supervisor's region: only admins get them.
  const shown = everyone ? users : users.map(({ repAccounts: _r, growerAccounts: _g, ...u }) => u);
  return NextResponse.json({ users: shown, total, page, pageSize: API_PAGE_SIZE });
});
