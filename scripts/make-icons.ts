// Draws Trenchbook's icon (a corn seedling above the soil line, its washed seminal and nodal roots
// below) as SVG and renders the PNGs the web app manifest lists. Run after changing the drawing:
//   npx tsx scripts/make-icons.ts
// The PNGs are committed; the build does not run this.
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import sharp from "sharp";

const out = path.resolve(import.meta.dirname, "..", "public", "icons");

// Colours from tailwind.config.ts.
const C = {
  sky: "#faf7f2", // soil-50
  soil: "#5a4529", // soil-700
  soilEdge: "#2a2016", // soil-900
  root: "#f2ebdf", // soil-100
  seminal: "#e2d5bf", // soil-200
  seed: "#c9b493", // soil-300
  leaf: "#3d8a4a", // sprout-500
  stem: "#245c30", // sprout-700
  rib: "#143a1c", // sprout-900
};

// The drawing on a 512 × 512 grid. `inset` shrinks it toward the centre (maskable icons keep their
// content inside the middle 80 %).
function drawing(inset: number): string {
  const s = 1 - 2 * inset;
  const t = 512 * inset;
  return `<g transform="translate(${t} ${t}) scale(${s})">
  <path d="M150 282 C 125 278 98 300 82 342 C 72 368 70 392 74 412" fill="none" stroke="${C.root}" stroke-width="11" stroke-linecap="round"/>
  <path d="M362 282 C 387 278 414 300 430 342 C 440 368 442 392 438 412" fill="none" stroke="${C.root}" stroke-width="11" stroke-linecap="round"/>
  <path d="M256 276 C 222 282 186 300 170 336 C 160 358 160 380 166 398" fill="none" stroke="${C.root}" stroke-width="10" stroke-linecap="round"/>
  <path d="M256 276 C 290 282 326 300 342 336 C 352 358 352 380 346 398" fill="none" stroke="${C.root}" stroke-width="10" stroke-linecap="round"/>
  <path d="M256 276 C 230 276 190 278 150 282" fill="none" stroke="${C.root}" stroke-width="11" stroke-linecap="round"/>
  <path d="M256 276 C 282 276 322 278 362 282" fill="none" stroke="${C.root}" stroke-width="11" stroke-linecap="round"/>
  <path d="M256 276 L 256 352" fill="none" stroke="${C.seminal}" stroke-width="7" stroke-linecap="round"/>
  <path d="M250 378 C 236 402 214 428 196 462" fill="none" stroke="${C.seminal}" stroke-width="6" stroke-linecap="round"/>
  <path d="M256 382 C 258 412 256 440 258 474" fill="none" stroke="${C.seminal}" stroke-width="6" stroke-linecap="round"/>
  <path d="M262 378 C 276 402 298 428 316 462" fill="none" stroke="${C.seminal}" stroke-width="6" stroke-linecap="round"/>
  <ellipse cx="256" cy="366" rx="21" ry="15" fill="${C.seed}" stroke="${C.soilEdge}" stroke-width="4"/>
  <path d="M256 262 L 256 120" fill="none" stroke="${C.stem}" stroke-width="18" stroke-linecap="round"/>
  <path d="M254 214 C 214 214 164 190 128 132 C 184 140 236 170 254 206 Z" fill="${C.leaf}" stroke="${C.rib}" stroke-width="5" stroke-linejoin="round"/>
  <path d="M252 208 C 214 196 176 170 146 144" fill="none" stroke="${C.rib}" stroke-width="4" stroke-linecap="round"/>
  <path d="M258 170 C 296 168 350 142 390 84 C 332 92 278 124 258 162 Z" fill="${C.leaf}" stroke="${C.rib}" stroke-width="5" stroke-linejoin="round"/>
  <path d="M260 164 C 300 150 340 124 372 96" fill="none" stroke="${C.rib}" stroke-width="4" stroke-linecap="round"/>
</g>`;
}

// The soil starts at y = 250 of the drawing; the band reaches the icon's edges in both forms.
function icon({ maskable }: { maskable: boolean }): string {
  const inset = maskable ? 0.1 : 0;
  const soilTop = 512 * inset + 250 * (1 - 2 * inset);
  const corner = maskable ? 0 : 96;
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 512 512" width="512" height="512">
<title>Trenchbook</title>
<clipPath id="r"><rect width="512" height="512" rx="${corner}"/></clipPath>
<g clip-path="url(#r)">
  <rect width="512" height="512" fill="${C.sky}"/>
  <rect y="${soilTop}" width="512" height="${512 - soilTop}" fill="${C.soil}"/>
  <rect y="${soilTop - 4}" width="512" height="10" fill="${C.soilEdge}"/>
  ${drawing(inset)}
</g>
</svg>
`;
}

mkdirSync(out, { recursive: true });
const regular = icon({ maskable: false });
const maskable = icon({ maskable: true });
writeFileSync(path.join(out, "icon.svg"), regular);

const renders: Array<[string, string, number]> = [
  ["icon-192.png", regular, 192],
  ["icon-512.png", regular, 512],
  ["icon-maskable-512.png", maskable, 512],
  ["apple-touch-icon.png", maskable, 180],
];
for (const [name, svg, size] of renders) {
  await sharp(Buffer.from(svg), { density: (72 * size) / 512 })
    .resize(size, size)
    .png({ compressionLevel: 9 })
    .toFile(path.join(out, name));
  console.log(`public/icons/${name} (${size} × ${size})`);
}
