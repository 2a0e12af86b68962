import { after, NextResponse } from "next/server";
import { z } from "zod";
import { notifyOpenedCases } from "@/lib/cases/notify";
import { authenticate, handle, jsonError, parseJson, zodIssues } from "@/lib/http";
import { PROTOCOL_VERSION, SCHEMA_VERSION } from "@/sync/protocol";
import { checkVersions } from "@/sync/server/pull";
import { pushEnvelopeSchema, pushMutations } from "@/sync/server/push";

// A push of up to 500 outbox entries (each record at most a few KB).
const MAX_PUSH_BYTES = 2 * 1024 * 1024;

const statedVersions = z.looseObject({ protocolVersion: z.number().int(), schemaVersion: z.number().int() });

const noStore = (res: Response) => {
  res.headers.set("cache-control", "no-store");
  return res;
};

// POST /api/sync/push: the device's outbox, applied exactly once (contract in sync/server/push.ts).
export const POST = handle("POST /api/sync/push", async (req) => {
  const auth = await authenticate();
  if (!auth.ok) return noStore(auth.response);
  const raw = await parseJson(req, z.unknown(), MAX_PUSH_BYTES);
  if (!raw.ok) return noStore(raw.response);
  // The versions first: a push of another protocol gets a clear answer whatever else it holds.
  const stated = statedVersions.safeParse(raw.data);
  const versions = stated.success
    ? checkVersions(stated.data.protocolVersion, stated.data.schemaVersion)
    : ({ ok: true } as const);
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
  const body = pushEnvelopeSchema.safeParse(raw.data);
  if (!body.success) return noStore(jsonError(422, "Some values are not valid.", zodIssues(body.error)));
  const outcome = await pushMutations(auth.user, body.data);
  switch (outcome.kind) {
    case "invalid":
      return noStore(jsonError(422, outcome.error));
    case "forbidden":
      return noStore(jsonError(403, outcome.error));
    case "gap":
      return noStore(
        NextResponse.json(
          {
            error: outcome.error,
            expectedMutationId: outcome.expectedMutationId,
            lastMutationId: outcome.lastMutationId,
          },
          { status: 409 },
        ),
      );
    case "ok":
      // The push has committed: the region's supervisors hear of the cases it opened once the device
      // has its answer (a slow or failing mail server never holds up or fails a push).
      if (outcome.openedCaseIds.length > 0) after(() => notifyOpenedCases(outcome.openedCaseIds));
      return noStore(NextResponse.json(outcome.response));
  }
});
