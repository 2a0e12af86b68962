// Draws the two JPEG "field photos" the offline dig test attaches (tests/fixtures/): soil-coloured
// gradients with fine grain, big enough (about 3 and 2 megapixels, over 1 MB each) that the in-browser
// compression has real work to do. Run once after changing the drawing:
//   npx tsx scripts/make-fixtures.ts
// The JPEGs are committed; tests never run this.
import { mkdirSync } from "node:fs";
import path from "node:path";
import sharp from "sharp";

const out = path.resolve(import.meta.dirname, "..", "tests", "fixtures");

// A small deterministic generator (mulberry32) so the files come out the same every time.
function random(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

// Soil brown at the bottom to pale root tones at the top, with root-like pale streaks and grain.
function draw(width: number, height: number, seed: number): Buffer {
  const r = random(seed);
  const px = Buffer.alloc(width * height * 3);
  const streaks = Array.from({ length: 40 }, () => ({ x: r() * width, slope: (r() - 0.5) * 0.6 }));
  for (let y = 0; y < height; y++) {
    const t = y / height;
    for (let x = 0; x < width; x++) {
      const grain = (r() - 0.5) * 70;
      const root = streaks.some((s) => Math.abs(x - (s.x + s.slope * y)) < 3) ? 90 : 0;
      const i = (y * width + x) * 3;
      px[i] = Math.max(0, Math.min(255, 226 - 136 * t + grain + root));
      px[i + 1] = Math.max(0, Math.min(255, 213 - 144 * t + grain + root));
      px[i + 2] = Math.max(0, Math.min(255, 191 - 150 * t + grain + root));
    }
  }
  return px;
}

mkdirSync(out, { recursive: true });
for (const [name, width, height, seed] of [
  ["roots-landscape.jpg", 2400, 1300, 11],
  ["roots-portrait.jpg", 1200, 1800, 29],
] as const) {
  const file = path.join(out, name);
  const info = await sharp(draw(width, height, seed), { raw: { width, height, channels: 3 } })
    .jpeg({ quality: 92 })
    .toFile(file);
  console.log(`${name}: ${info.width}×${info.height}, ${(info.size / 1024).toFixed(0)} KB`);
}
