import type { IndexBand } from "@/lib/geo/map-features";

// Pins of our own design: the root index band is told by shape AND a letter, the colour only repeats
// it; a flagged dig adds a heavy dark ring and a "!" badge. Every fill carries a dark outline (≥ 3:1
// against the plain map background) and its letter meets 4.5:1 on the fill.

export interface BandStyle {
  fill: string;
  ink: string;
  letter: string;
}

export const BAND_STYLES: Record<IndexBand, BandStyle> = {
  // #1f5f99 / white 6.6:1
  good: { fill: "#1f5f99", ink: "#ffffff", letter: "G" },
  // #e8a317 / #1a1a1a 8.9:1
  fair: { fill: "#e8a317", ink: "#1a1a1a", letter: "F" },
  // #a32a17 / white 7.1:1
  poor: { fill: "#a32a17", ink: "#ffffff", letter: "P" },
  // white / #1a1a1a 17:1, dashed outline
  unscored: { fill: "#ffffff", ink: "#1a1a1a", letter: "?" },
};

export const PIN_SIZE = 30;
const OUTLINE = "#1a1a1a";

function shapeOf(band: IndexBand): string {
  const s = BAND_STYLES[band];
  const stroke = `stroke="${OUTLINE}" stroke-width="1.5"`;
  switch (band) {
    case "good":
      return `<circle cx="15" cy="15" r="9.5" fill="${s.fill}" ${stroke}/>`;
    case "fair":
      return `<rect x="6" y="6" width="18" height="18" rx="2" fill="${s.fill}" ${stroke}/>`;
    case "poor":
      return `<path d="M15 4.5 L25.5 23.5 L4.5 23.5 Z" fill="${s.fill}" ${stroke} stroke-linejoin="round"/>`;
    case "unscored":
      return `<path d="M15 5 L25 15 L15 25 L5 15 Z" fill="${s.fill}" ${stroke} stroke-dasharray="3 2"/>`;
  }
}

const BADGE = `<circle cx="24.5" cy="5.5" r="5" fill="#1a1a1a" stroke="#ffffff" stroke-width="1"/><text x="24.5" y="8.6" text-anchor="middle" font-size="8.5" font-weight="700" font-family="system-ui,sans-serif" fill="#ffffff">!</text>`;
const RING = `<circle cx="15" cy="15" r="13.5" fill="none" stroke="#1a1a1a" stroke-width="2.5"/>`;

/** The SVG markup of a pin (decorative: the element holding it carries the accessible name). */
export function pinSvg(band: IndexBand, flagged: boolean): string {
  const s = BAND_STYLES[band];
  const textY = band === "poor" ? 20.5 : 19;
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${PIN_SIZE}" height="${PIN_SIZE}" viewBox="0 0 30 30" aria-hidden="true" focusable="false">${
    flagged ? RING : ""
  }${shapeOf(band)}<text x="15" y="${textY}" text-anchor="middle" font-size="11" font-weight="700" font-family="system-ui,sans-serif" fill="${
    s.ink
  }">${s.letter}</text>${flagged ? BADGE : ""}</svg>`;
}

/** A cluster: a dark disc with the number of digs; "!" when some of them are flagged. */
export function clusterSvg(count: number, flagged: number): { html: string; size: number } {
  const size = count < 100 ? 36 : count < 1000 ? 42 : 50;
  const r = size / 2 - 2;
  const label = count >= 10000 ? `${Math.round(count / 1000)}k` : String(count);
  const font = label.length <= 2 ? 14 : label.length === 3 ? 13 : 12;
  const badge =
    flagged > 0
      ? `<circle cx="${size - 7}" cy="7" r="6.5" fill="#1a1a1a" stroke="#ffffff" stroke-width="1.2"/><text x="${
          size - 7
        }" y="11" text-anchor="middle" font-size="10" font-weight="700" font-family="system-ui,sans-serif" fill="#ffffff">!</text>`
      : "";
  const html = `<svg xmlns="http://www.w3.org/2000/svg" width="${size}" height="${size}" viewBox="0 0 ${size} ${size}" aria-hidden="true" focusable="false"><circle cx="${
    size / 2
  }" cy="${size / 2}" r="${r}" fill="#2a2016" stroke="#ffffff" stroke-width="3"/><circle cx="${size / 2}" cy="${
    size / 2
  }" r="${r + 1.5}" fill="none" stroke="#2a2016" stroke-width="1"/><text x="${size / 2}" y="${
    size / 2 + font / 2.8
  }" text-anchor="middle" font-size="${font}" font-weight="700" font-family="system-ui,sans-serif" fill="#ffffff">${label}</text>${badge}</svg>`;
  return { html, size };
}

/** A plain location pin for a single point (case and dig pages). */
export const POINT_SVG = `<svg xmlns="http://www.w3.org/2000/svg" width="30" height="30" viewBox="0 0 30 30" aria-hidden="true" focusable="false"><circle cx="15" cy="15" r="10" fill="#ffffff" stroke="#1a1a1a" stroke-width="2.5"/><circle cx="15" cy="15" r="4.5" fill="#1a1a1a"/></svg>`;

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) =>
    c === "&" ? "&amp;" : c === "<" ? "&lt;" : c === ">" ? "&gt;" : c === '"' ? "&quot;" : "&#39;",
  );
}
