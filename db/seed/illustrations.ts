import "server-only";
import { createHash } from "node:crypto";
import { PutObjectCommand } from "@aws-sdk/client-s3";
import { bucket, s3 } from "@/lib/storage/s3";
import type { MesocotylCondition } from "@/lib/agronomy";

// The demo scenario has no real photographs. Its "photos" are drawings made from the recorded
// measurements, each stamped in large letters as an illustration so nobody mistakes one for a field
// photo.

export const ILLUSTRATION_WIDTH = 800;
export const ILLUSTRATION_HEIGHT = 600;
export const ILLUSTRATION_BANNER = "ILLUSTRATION — not a field photo";

export interface IllustratedPlant {
  leafCollars: number;
  seedingDepthIn: number;
  crownDepthIn: number;
  mesocotyl: MesocotylCondition;
  seminalScore: number;
  nodalCount: number;
  longestNodalIn: number;
  burn: boolean;
  /** Where the band was found, inches beside and below the seed; null when not seen. */
  band: { besideIn: number; belowIn: number } | null;
}

export interface IllustrationLabel {
  title: string;
  subtitle: string;
}

const GROUND_Y = 200;
const PX_PER_IN = 55;
const STEM_X = 330;

const MESOCOTYL_COLOUR: Record<MesocotylCondition, string> = {
  healthy: "#f3ead0",
  discolored: "#c49a5a",
  damaged: "#8a5a32",
  severed: "#5b3a22",
};

function escapeXml(text: string): string {
  return text.replace(/[<>&"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

const f1 = (x: number) => x.toFixed(1);

/** An SVG drawing of a dug plant's roots from its measurements, marked as an illustration. */
export function illustrationSvg(plant: IllustratedPlant, label: IllustrationLabel): string {
  const seedY = GROUND_Y + plant.seedingDepthIn * PX_PER_IN;
  const crownY = GROUND_Y + plant.crownDepthIn * PX_PER_IN;
  const parts: string[] = [];

  // Leaves: one pair of blades per visible collar, alternating sides up the stem.
  const leaves = Math.max(1, plant.leafCollars + 1);
  const stemTop = GROUND_Y - 30 - 14 * leaves;
  parts.push(
    `<line x1="${STEM_X}" y1="${f1(crownY)}" x2="${STEM_X}" y2="${stemTop}" stroke="#3f7d2c" stroke-width="7"/>`,
  );
  for (let i = 0; i < leaves; i++) {
    const y = GROUND_Y - 20 - 14 * i;
    const side = i % 2 === 0 ? 1 : -1;
    const length = 40 + 10 * Math.min(i, 5);
    parts.push(
      `<path d="M ${STEM_X} ${y} q ${side * length * 0.6} ${-28} ${side * length} ${-8}" fill="none" stroke="#4f9a38" stroke-width="6" stroke-linecap="round"/>`,
    );
  }

  // Mesocotyl from the seed up to the crown, coloured by its condition.
  parts.push(
    `<line x1="${STEM_X}" y1="${f1(seedY)}" x2="${STEM_X}" y2="${f1(crownY)}" stroke="${MESOCOTYL_COLOUR[plant.mesocotyl]}" stroke-width="4"${plant.mesocotyl === "severed" ? ' stroke-dasharray="6 6"' : ""}/>`,
  );
  parts.push(`<ellipse cx="${STEM_X}" cy="${f1(seedY)}" rx="11" ry="8" fill="#e8c65a" stroke="#7a5a1a"/>`);

  // Seminal roots from the seed: one per score point, fanned downward.
  const seminal = Math.max(0, Math.round(plant.seminalScore));
  for (let i = 0; i < seminal; i++) {
    const angle = ((i + 1) / (seminal + 1)) * Math.PI;
    const length = 110;
    const x = STEM_X - Math.cos(angle) * length;
    const y = seedY + Math.sin(angle) * length * 0.9;
    // Burn browns the roots around a seed-placed starter, or those facing a band.
    const burnt = plant.burn && (plant.band === null || x > STEM_X);
    parts.push(
      `<path d="M ${STEM_X} ${f1(seedY)} Q ${f1((STEM_X + x) / 2)} ${f1(seedY + 30)} ${f1(x)} ${f1(y)}" fill="none" stroke="${burnt ? "#6b3a1c" : "#f6f1e3"}" stroke-width="2.5"/>`,
    );
  }

  // Nodal roots from the crown, fanned and drawn to the longest root's length (capped to the frame).
  const nodal = Math.min(plant.nodalCount, 24);
  const nodalLength = Math.min(plant.longestNodalIn * PX_PER_IN * 0.5, 330);
  for (let i = 0; i < nodal; i++) {
    const angle = 0.15 * Math.PI + ((i + 0.5) / nodal) * 0.7 * Math.PI;
    const x = STEM_X - Math.cos(angle) * nodalLength;
    const y = Math.min(ILLUSTRATION_HEIGHT - 70, crownY + Math.sin(angle) * nodalLength * 0.8);
    const towardBand = plant.burn && plant.band !== null && x > STEM_X;
    parts.push(
      `<line x1="${STEM_X}" y1="${f1(crownY)}" x2="${f1(x)}" y2="${f1(y)}" stroke="${towardBand ? "#6b3a1c" : "#fbf6e9"}" stroke-width="2"/>`,
    );
  }

  if (plant.band) {
    const bx = STEM_X + plant.band.besideIn * PX_PER_IN;
    const by = seedY + plant.band.belowIn * PX_PER_IN;
    parts.push(
      `<ellipse cx="${f1(bx)}" cy="${f1(by)}" rx="16" ry="10" fill="#2f6fa3" fill-opacity="0.55" stroke="#1d4f7a" stroke-dasharray="4 3"/>`,
      `<text x="${f1(bx + 24)}" y="${f1(by + 5)}" font-size="18" fill="#ffffff">band ${plant.band.besideIn.toFixed(1)} in beside, ${plant.band.belowIn.toFixed(1)} in below</text>`,
    );
  }
  if (plant.burn) {
    parts.push(
      `<text x="${STEM_X + 40}" y="${f1(seedY - 12)}" font-size="20" font-weight="bold" fill="#ffd7c2">burned root tips</text>`,
    );
  }

  return [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${ILLUSTRATION_WIDTH}" height="${ILLUSTRATION_HEIGHT}" viewBox="0 0 ${ILLUSTRATION_WIDTH} ${ILLUSTRATION_HEIGHT}" role="img" aria-label="${escapeXml(`${ILLUSTRATION_BANNER}: ${label.title}`)}" font-family="sans-serif">`,
    `<title>${escapeXml(`${ILLUSTRATION_BANNER}: ${label.title}`)}</title>`,
    `<rect width="${ILLUSTRATION_WIDTH}" height="${GROUND_Y}" fill="#eef3f6"/>`,
    `<rect y="${GROUND_Y}" width="${ILLUSTRATION_WIDTH}" height="${ILLUSTRATION_HEIGHT - GROUND_Y}" fill="#7b5b3e"/>`,
    `<line x1="0" y1="${GROUND_Y}" x2="${ILLUSTRATION_WIDTH}" y2="${GROUND_Y}" stroke="#4d3824" stroke-width="3"/>`,
    `<text x="${ILLUSTRATION_WIDTH / 2}" y="${ILLUSTRATION_HEIGHT / 2 + 60}" font-size="96" font-weight="bold" fill="#ffffff" fill-opacity="0.12" text-anchor="middle" transform="rotate(-20 ${ILLUSTRATION_WIDTH / 2} ${ILLUSTRATION_HEIGHT / 2})">ILLUSTRATION</text>`,
    ...parts,
    `<rect x="0" y="0" width="${ILLUSTRATION_WIDTH}" height="64" fill="#ffd84d"/>`,
    `<text x="${ILLUSTRATION_WIDTH / 2}" y="46" font-size="38" font-weight="bold" fill="#1d1d1d" text-anchor="middle">${escapeXml(ILLUSTRATION_BANNER)}</text>`,
    `<rect x="0" y="${ILLUSTRATION_HEIGHT - 56}" width="${ILLUSTRATION_WIDTH}" height="56" fill="#1d1d1d" fill-opacity="0.75"/>`,
    `<text x="16" y="${ILLUSTRATION_HEIGHT - 32}" font-size="20" fill="#ffffff">${escapeXml(label.title)}</text>`,
    `<text x="16" y="${ILLUSTRATION_HEIGHT - 10}" font-size="15" fill="#dddddd">${escapeXml(label.subtitle)}</text>`,
    "</svg>",
    "",
  ].join("\n");
}

export interface StoredObject {
  sha256: string;
  byteSize: number;
  objectKey: string;
  contentType: string;
}

/** Puts the bytes in the photo bucket under `photos/<sha256>`, as the app's photo uploads do. */
export async function uploadIllustration(svg: string): Promise<StoredObject> {
  const bytes = Buffer.from(svg, "utf8");
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const stored = {
    sha256,
    byteSize: bytes.byteLength,
    objectKey: `photos/${sha256}`,
    contentType: "image/svg+xml",
  };
  await s3.send(
    new PutObjectCommand({
      Bucket: bucket,
      Key: stored.objectKey,
      Body: bytes,
      ContentType: stored.contentType,
      ContentLength: stored.byteSize,
    }),
  );
  return stored;
}
