import { NextResponse } from "next/server";
import { authenticate, handle, jsonError, parseJson } from "@/lib/http";
import { photoPresignSchema, presignPhotoUpload } from "@/sync/server/photos";

// POST /api/photos/presign: where to upload a photo's bytes (contract in sync/server/photos.ts).
// { exists: true } when the bucket already holds them; else a PUT URL bound to the content type and
// size, valid for 5 minutes.
export const POST = handle("POST /api/photos/presign", async (req) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const body = await parseJson(req, photoPresignSchema);
  if (!body.ok) return body.response;
  const presign = await presignPhotoUpload(auth.user, body.data);
  const res =
    presign.kind === "refused"
      ? jsonError(presign.status, presign.error)
      : presign.kind === "exists"
        ? NextResponse.json({ exists: true, key: presign.key, confirmed: presign.confirmed })
        : NextResponse.json({
            exists: false,
            key: presign.key,
            url: presign.url,
            method: "PUT",
            headers: presign.headers,
            expiresAt: presign.expiresAt,
          });
  res.headers.set("cache-control", "no-store");
  return res;
});
