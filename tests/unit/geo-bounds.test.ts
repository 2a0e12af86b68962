import { describe, expect, it } from "vitest";
import { clampBounds, formatBounds, parseBounds } from "@/lib/geo/bounds";
import { indexBand } from "@/lib/geo/map-features";

describe("parseBounds", () => {
  it("reads west,south,east,north in degrees", () => {
    expect(parseBounds("-120.5,36.25,-120.25,36.5")).toEqual({
      ok: true,
      bounds: { west: -120.5, south: 36.25, east: -120.25, north: 36.5 },
    });
    expect(parseBounds(" -180 , -90 , 180 , 90 ")).toEqual({
      ok: true,
      bounds: { west: -180, south: -90, east: 180, north: 90 },
    });
    expect(parseBounds("1e-3,0,.5,1")).toMatchObject({ ok: true, bounds: { west: 0.001, east: 0.5 } });
  });

  it.each([
    [null, "bbox=west,south,east,north"],
    ["", "bbox=west,south,east,north"],
    ["1,2,3", "four numbers"],
    ["1,2,3,4,5", "four numbers"],
    ["a,2,3,4", "decimal number"],
    ["0x10,2,3,4", "decimal number"],
    ["1,,3,4", "decimal number"],
    ["Infinity,0,1,1", "decimal number"],
    ["0,0,1e999,1", "finite"],
    ["0,-91,1,1", "south latitude must be between -90 and 90"],
    ["0,0,1,90.5", "north latitude must be between -90 and 90"],
    ["-181,0,1,1", "west longitude must be between -180 and 180"],
    ["0,0,180.1,1", "east longitude must be between -180 and 180"],
    ["0,5,1,5", "south latitude must be less than the north"],
    ["0,6,1,5", "south latitude must be less than the north"],
    ["170,0,-170,1", "antimeridian"],
    ["3,0,3,1", "antimeridian"],
  ])("refuses %j with a clear message", (value, message) => {
    const r = parseBounds(value);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toContain(message);
  });
});

describe("formatBounds and clampBounds", () => {
  it("rounds to 6 decimals and parses back", () => {
    const s = formatBounds({ west: -120.123456789, south: 36.1, east: -120.0000004, north: 36.2 });
    expect(s).toBe("-120.123457,36.1,-120,36.2");
    expect(parseBounds(s).ok).toBe(true);
  });

  it("clamps a zoomed-out view to the world", () => {
    expect(clampBounds({ west: -200, south: -95, east: -150, north: 95 })).toEqual({
      west: -180,
      south: -90,
      east: -150,
      north: 90,
    });
    expect(clampBounds({ west: -400, south: 0, east: 400, north: 1 })).toMatchObject({
      west: -180,
      east: 180,
    });
  });
});

describe("indexBand", () => {
  // Thresholds of the low_root_index flag in lib/agronomy/injury.ts (60 warning, 40 critical).
  it.each([
    [null, "unscored"],
    [100, "good"],
    [60, "good"],
    [59.9, "fair"],
    [40, "fair"],
    [39.9, "poor"],
    [0, "poor"],
  ] as const)("%s → %s", (index, band) => {
    expect(indexBand(index)).toBe(band);
  });
});
