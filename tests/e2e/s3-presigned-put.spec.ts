// A presigned PUT from the browser: the page on the app's origin uploads straight to the bucket, which
// only works when the bucket's CORS rules (minio-fake/cors.xml) let the browser's preflight through.
import { createHash, randomBytes, randomUUID } from "node:crypto";
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  PutObjectCommand,
} from "@aws-sdk/client-s3";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { expect, test } from "@playwright/test";
import { bucket, s3 } from "../../lib/storage/s3";

test("a browser uploads a photo to a presigned PUT URL and the bucket holds the same bytes", async ({
  page,
}) => {
  const bytes = randomBytes(48 * 1024);
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const md5 = createHash("md5").update(bytes).digest("hex");
  const Key = `e2e/${randomUUID()}/${sha256}.jpg`;
  const url = await getSignedUrl(
    s3,
    new PutObjectCommand({ Bucket: bucket, Key, ContentType: "image/jpeg" }),
    {
      expiresIn: 300,
    },
  );

  await page.goto("/sign-in");
  const origin = new URL(page.url()).origin;
  expect(origin).toMatch(/^http:\/\//);
  expect(new URL(url).origin).not.toBe(origin);

  const result = await page.evaluate(
    async ({ url, data }) => {
      const res = await fetch(url, {
        method: "PUT",
        body: new Blob([new Uint8Array(data)]),
        headers: { "content-type": "image/jpeg" },
      });
      // ETag is readable only because the bucket's CORS rules expose it.
      return { status: res.status, etag: res.headers.get("etag") };
    },
    { url, data: [...bytes] },
  );
  try {
    expect(result.status).toBe(200);
    expect(result.etag).toBe(`"${md5}"`);

    const head = await s3.send(new HeadObjectCommand({ Bucket: bucket, Key }));
    expect(head.ContentLength).toBe(bytes.length);
    expect(head.ContentType).toBe("image/jpeg");
    const got = await s3.send(new GetObjectCommand({ Bucket: bucket, Key }));
    const stored = Buffer.from(await got.Body!.transformToByteArray());
    expect(createHash("sha256").update(stored).digest("hex")).toBe(sha256);
  } finally {
    await s3.send(new DeleteObjectCommand({ Bucket: bucket, Key }));
  }
});
