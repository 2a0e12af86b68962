// The S3 fake through the same client the app uses: objects go in and come back byte for byte, the
// ETag is the MD5 of the body, and a presigned PUT URL accepts an upload from plain HTTP.
import { createHash, randomBytes, randomUUID } from "node:crypto";
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  PutObjectCommand,
} from "@aws-sdk/client-s3";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { afterAll, describe, expect, it } from "vitest";
import { bucket, s3 } from "@/lib/storage/s3";

const prefix = `storage-test/${randomUUID()}`;
const written: string[] = [];
const md5 = (bytes: Uint8Array) => createHash("md5").update(bytes).digest("hex");

afterAll(async () => {
  for (const Key of written) await s3.send(new DeleteObjectCommand({ Bucket: bucket, Key }));
});

describe("S3 fake", () => {
  it("stores an object and answers HEAD with its size and MD5 ETag, and GET with the same bytes", async () => {
    const Key = `${prefix}/root-photo.jpg`;
    const body = randomBytes(150 * 1024);
    written.push(Key);
    const put = await s3.send(
      new PutObjectCommand({ Bucket: bucket, Key, Body: body, ContentType: "image/jpeg" }),
    );
    expect(put.ETag).toBe(`"${md5(body)}"`);

    const head = await s3.send(new HeadObjectCommand({ Bucket: bucket, Key }));
    expect(head.ContentLength).toBe(body.length);
    expect(head.ETag).toBe(`"${md5(body)}"`);
    expect(head.ContentType).toBe("image/jpeg");

    const got = await s3.send(new GetObjectCommand({ Bucket: bucket, Key }));
    const bytes = await got.Body!.transformToByteArray();
    expect(Buffer.from(bytes).equals(body)).toBe(true);
  });

  it("answers HEAD for a missing object with NotFound", async () => {
    await expect(
      s3.send(new HeadObjectCommand({ Bucket: bucket, Key: `${prefix}/missing.jpg` })),
    ).rejects.toMatchObject({
      $metadata: { httpStatusCode: 404 },
    });
  });

  it("accepts an upload to a presigned PUT URL from Node's fetch", async () => {
    const body = randomBytes(64 * 1024);
    const Key = `${prefix}/${createHash("sha256").update(body).digest("hex")}.jpg`;
    written.push(Key);
    const url = await getSignedUrl(
      s3,
      new PutObjectCommand({ Bucket: bucket, Key, ContentType: "image/jpeg" }),
      {
        expiresIn: 300,
      },
    );
    expect(url).toContain("X-Amz-Signature=");
    const res = await fetch(url, { method: "PUT", body, headers: { "content-type": "image/jpeg" } });
    expect(res.status).toBe(200);
    expect(res.headers.get("etag")).toBe(`"${md5(body)}"`);

    const head = await s3.send(new HeadObjectCommand({ Bucket: bucket, Key }));
    expect(head.ContentLength).toBe(body.length);
    expect(head.ETag).toBe(`"${md5(body)}"`);
    expect(head.ContentType).toBe("image/jpeg");
  });

  // The fake does not check V4 signatures, but it does enforce expiry, as S3 does.
  it("refuses an upload to an expired presigned PUT URL", async () => {
    const Key = `${prefix}/expired.jpg`;
    const url = await getSignedUrl(
      s3,
      new PutObjectCommand({ Bucket: bucket, Key, ContentType: "image/jpeg" }),
      {
        expiresIn: 60,
        signingDate: new Date(Date.now() - 10 * 60_000),
      },
    );
    const res = await fetch(url, { method: "PUT", body: "x", headers: { "content-type": "image/jpeg" } });
    expect(res.status).toBe(403);
    await expect(s3.send(new HeadObjectCommand({ Bucket: bucket, Key }))).rejects.toMatchObject({
      $metadata: { httpStatusCode: 404 },
    });
  });
});
