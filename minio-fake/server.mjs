// The local stand-in for the S3 API: an s3rver instance on loopback with the photo bucket and the
// CORS rules a browser's presigned PUT needs. Self-contained: imports nothing from the app.
// s3rver accepts only its built-in credentials (access key and secret both "S3RVER").
import { mkdirSync, readFileSync } from "node:fs";
import path from "node:path";
import S3rver from "s3rver";

const port = Number(process.env.S3_FAKE_PORT ?? 54330);
const directory = path.resolve(process.env.S3_FAKE_DIR ?? ".data/s3");
const buckets = (process.env.S3_FAKE_BUCKET ?? "trenchbook-photos").split(",");
const cors = readFileSync(new URL("./cors.xml", import.meta.url));

mkdirSync(directory, { recursive: true });
const server = new S3rver({
  address: "127.0.0.1",
  port,
  directory,
  silent: true,
  vhostBuckets: false,
  configureBuckets: buckets.map((name) => ({ name, configs: [cors] })),
});

await server.run();
console.log(`S3 fake on http://127.0.0.1:${port} (bucket ${buckets.join(", ")}, data in ${directory})`);

for (const signal of ["SIGINT", "SIGTERM"]) {
  process.on(signal, () => server.close().then(() => process.exit(0)));
}
