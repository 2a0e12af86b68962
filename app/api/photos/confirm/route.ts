import { NextResponse } from "next/server";
import { authenticate, handle, jsonError, parseJson } from "@/lib/http";
import { confirmPhotoObject, photoConfirmSchema } from "@/sync/server/photos";

// POST /api/photos/confirm: the server checks an uploaded photo's size and SHA-256 in the bucket
// (contract in sync/server/photos.ts). Only roles that record digs upload photos.
export const POST = handle("POST /api/photos/confirm", async (req) => {
  const auth = await authenticate(["rep", "admin"]);
  if (!auth.ok) return auth.response;
  const body = await parseJson(req, photoConfirmSchema);
  if (!body.ok) return body.response;
  const confirmation = await confirmPhotoObject(body.data);
  const res = confirmation.ok ? NextResponse.json({ confirmed: true }) : jsonError(422, confirmation.reason);
  res.headers.set("cache-control", "no-store");
  return res;
});
