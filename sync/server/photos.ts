import "server-only";
import { createHash } from "node:crypto";
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  PutObjectCommand,
} from "@aws-sdk/client-s3";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { z } from "zod";
import { db } from "@/db/client";
import { findAccountAccess } from "@/db/queries/access";
import { type Actor, can } from "@/lib/auth/permissions";
import { bucket, s3 } from "@/lib/storage/s3";
import { photoSchema } from "../protocol";
import { photoObjectKey } from "./push";

// Photos upload first and are referenced second (shared/SYNC.md, "Photos"):
//  1. presign: the device asks for a PUT URL for the photo's bytes, keyed by their SHA-256, for a dig
//     it may write. A dig not pushed yet is named by its field (fieldId), so photos taken offline
//     can upload before their dig's first push. When the object is already stored (the same photo
//     twice, an upload that finished before a cut) there is nothing to upload.
//  2. PUT to the bucket, with the content type and length the URL was signed for (5-minute expiry).
//  3. confirm: the server checks the stored object's size (HEAD) and the SHA-256 of its bytes (the
//     bucket's ETag is an MD5), once per object, and records it in photo_object.
//  4. push photo.put: applied only once its object is confirmed; before that the push holds there
//     (sync/server/push.ts), so a photo row never points at a missing object.

export const PRESIGN_EXPIRY_SECONDS = 300;

const id = z.guid({ error: "Not a valid record id." });
const photoBytes = photoSchema.pick({ sha256: true, byteSize: true, contentType: true }).shape;

export const photoPresignSchema = z.strictObject({
  photoId: id,
  digSiteId: id,
  // The dig's field, for a dig this device has not pushed yet.
  fieldId: id.nullable().optional(),
  ...photoBytes,
});
export type PhotoPresignRequest = z.infer<typeof photoPresignSchema>;

export const photoConfirmSchema = z.strictObject({
  sha256: photoBytes.sha256,
  byteSize: photoBytes.byteSize,
});
export type PhotoConfirmRequest = z.infer<typeof photoConfirmSchema>;

export type Presign =
  | { kind: "refused"; status: 403 | 404; error: string }
  | { kind: "exists"; key: string; confirmed: boolean }
  | { kind: "upload"; key: string; url: string; headers: Record<string, string>; expiresAt: string };

// Which account the photo's dig belongs to: the dig's, or for a dig not pushed yet its field's.
async function digAccount(request: PhotoPresignRequest): Promise<string | undefined> {
  const dig = await db
    .selectFrom("digSite")
    .select("accountId")
    .where("id", "=", request.digSiteId)
    .where("deletedAt", "is", null)
    .executeTakeFirst();
  if (dig) return dig.accountId;
  if (!request.fieldId) return undefined;
  const claimed = await db
    .selectFrom("digSite")
    .select("id")
    .where("id", "=", request.digSiteId)
    .executeTakeFirst();
  if (claimed) return undefined; // a deleted dig takes no new photos
  const field = await db
    .selectFrom("field")
    .select("accountId")
    .where("id", "=", request.fieldId)
    .where("deletedAt", "is", null)
    .executeTakeFirst();
  return field?.accountId;
}

async function storedSize(key: string): Promise<number | null> {
  try {
    const head = await s3.send(new HeadObjectCommand({ Bucket: bucket, Key: key }));
    return head.ContentLength ?? null;
  } catch (err) {
    if ((err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return null;
    throw err;
  }
}

/**
 * A presigned PUT for a photo of a dig the actor may write (404 for a dig or field they cannot see,
 * 403 for one they may only read), or "exists" when the bucket already holds the bytes. Idempotent:
 * asking again gives a fresh URL for the same key.
 */
export async function presignPhotoUpload(actor: Actor, request: PhotoPresignRequest): Promise<Presign> {
  const accountId = await digAccount(request);
  const access = accountId ? await findAccountAccess(actor, accountId) : undefined;
  if (!access || !can(actor, "read", { kind: "digSite", access })) {
    return {
      kind: "refused",
      status: 404,
      error: request.fieldId
        ? "No such dig site or field."
        : "No such dig site. For a dig not synced yet, send its fieldId.",
    };
  }
  if (!can(actor, "write", { kind: "digSite", access })) {
    return {
      kind: "refused",
      status: 403,
      error: "Only the rep who serves this farm can add photos to its digs.",
    };
  }
  const key = photoObjectKey(request.sha256);
  const confirmed = await db
    .selectFrom("photoObject")
    .select("byteSize")
    .where("sha256", "=", request.sha256)
    .executeTakeFirst();
  if (confirmed?.byteSize === request.byteSize) return { kind: "exists", key, confirmed: true };
  if ((await storedSize(key)) === request.byteSize) return { kind: "exists", key, confirmed: false };
  const url = await getSignedUrl(
    s3,
    new PutObjectCommand({
      Bucket: bucket,
      Key: key,
      ContentType: request.contentType,
      ContentLength: request.byteSize,
    }),
    {
      expiresIn: PRESIGN_EXPIRY_SECONDS,
      // Both are part of the signature: the upload must be this type and exactly this size.
      signableHeaders: new Set(["content-type", "content-length"]),
    },
  );
  return {
    kind: "upload",
    key,
    url,
    headers: { "content-type": request.contentType },
    expiresAt: new Date(Date.now() + PRESIGN_EXPIRY_SECONDS * 1000).toISOString(),
  };
}

export type Confirmation = { ok: true } | { ok: false; reason: string };

/**
 * Verifies the object stored under `photos/<sha256>`: its size, then the SHA-256 of its bytes
 * (streamed, never held whole). Bytes that do not match their hash are deleted so the device can
 * upload again. Idempotent: a confirmed object answers at once.
 */
export async function confirmPhotoObject({ sha256, byteSize }: PhotoConfirmRequest): Promise<Confirmation> {
  const known = await db
    .selectFrom("photoObject")
    .select("byteSize")
    .where("sha256", "=", sha256)
    .executeTakeFirst();
  if (known) {
    return known.byteSize === byteSize
      ? { ok: true }
      : {
          ok: false,
          reason: `The photo stored under this hash is ${known.byteSize} bytes, not ${byteSize}.`,
        };
  }
  const key = photoObjectKey(sha256);
  const size = await storedSize(key);
  if (size === null) return { ok: false, reason: "The photo is not in the store yet: upload it first." };
  if (size !== byteSize) {
    await s3.send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
    return { ok: false, reason: `The stored photo is ${size} bytes, not ${byteSize}: upload it again.` };
  }
  const object = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
  const hash = createHash("sha256");
  for await (const chunk of object.Body as AsyncIterable<Uint8Array>) hash.update(chunk);
  if (hash.digest("hex") !== sha256) {
    await s3.send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
    return { ok: false, reason: "The uploaded bytes do not match the photo's SHA-256: upload it again." };
  }
  await db
    .insertInto("photoObject")
    .values({ sha256, byteSize })
    .onConflict((oc) => oc.column("sha256").doNothing())
    .execute();
  return { ok: true };
}
