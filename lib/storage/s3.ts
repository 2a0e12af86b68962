import "server-only";
import { GetObjectCommand, HeadBucketCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { env } from "@/lib/env";

// Path-style addressing for the local fake and S3-compatible stores; checksums only when an
// operation requires them, so presigned PUTs from browsers carry no checksum of an empty body.
export const s3 = new S3Client({
  endpoint: env.S3_ENDPOINT,
  region: env.S3_REGION,
  forcePathStyle: true,
  requestChecksumCalculation: "WHEN_REQUIRED",
  responseChecksumValidation: "WHEN_REQUIRED",
  credentials: { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY },
});

export const bucket = env.S3_BUCKET;

export async function checkObjectStore(): Promise<void> {
  await s3.send(new HeadBucketCommand({ Bucket: bucket }));
}

// Short-lived read links: photos and reports are never public; a page asks for a link per view.
export const PRESIGNED_GET_SECONDS = 300;

export async function presignedGetUrl(
  key: string,
  options: { expiresIn?: number; downloadAs?: string } = {},
): Promise<{ url: string; expiresAt: string }> {
  const expiresIn = options.expiresIn ?? PRESIGNED_GET_SECONDS;
  const url = await getSignedUrl(
    s3,
    new GetObjectCommand({
      Bucket: bucket,
      Key: key,
      ResponseContentDisposition: options.downloadAs
        ? `attachment; filename="${options.downloadAs.replace(/["\\\r\n]/g, "_")}"`
        : undefined,
    }),
    { expiresIn },
  );
  return { url, expiresAt: new Date(Date.now() + expiresIn * 1000).toISOString() };
}

export async function putObject(key: string, body: Uint8Array, contentType: string): Promise<void> {
  await s3.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: body, ContentType: contentType }));
}

export async function getObjectBytes(key: string): Promise<Uint8Array> {
  const object = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
  if (!object.Body) throw new Error(`Object ${key} has no body`);
  return object.Body.transformToByteArray();
}
