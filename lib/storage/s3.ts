import "server-only";
import { HeadBucketCommand, S3Client } from "@aws-sdk/client-s3";
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
