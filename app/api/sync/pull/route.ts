import { NextResponse } from "next/server";
import { authenticate, handle, jsonError, parseJson } from "@/lib/http";
import { PROTOCOL_VERSION, pullRequestSchema, SCHEMA_VERSION } from "@/sync/protocol";
import { checkVersions, claimClientGroup, pullChanges } from "@/sync/server/pull";

// A pull is never answered from a cache, neither by the browser nor by anything in between.
const noStore = (res: Response) => {
  res.headers.set("cache-control", "no-store");
  return res;
};

export const POST = handle("POST /api/sync/pull", async (req) => {
  const auth = await authenticate();
  if (!auth.ok) return noStore(auth.response);
  const body = await parseJson(req, pullRequestSchema);
  if (!body.ok) return noStore(body.response);
  const { protocolVersion, schemaVersion, clientGroupId, cursor } = body.data;
  const versions = checkVersions(protocolVersion, schemaVersion);
  if (!versions.ok) {
    return noStore(
      NextResponse.json(
        {
          error: versions.error,
          supported: {
            protocolVersion: PROTOCOL_VERSION,
            schemaVersions: [SCHEMA_VERSION - 1, SCHEMA_VERSION],
          },
        },
        { status: 409 },
      ),
    );
  }
  if (!(await claimClientGroup(clientGroupId, auth.user.id))) {
    return noStore(jsonError(403, "This device's sync identity belongs to another user."));
  }
  return noStore(NextResponse.json(await pullChanges(auth.user, clientGroupId, cursor)));
});
