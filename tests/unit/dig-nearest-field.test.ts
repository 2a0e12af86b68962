import { describe, expect, it } from "vitest";
import { distanceMeters, nearestField, pointInBoundary } from "@/lib/digs/nearest-field";

// Two square fields side by side and a third with a hole (a farmstead), [lon, lat] corners.
const square = (lon: number, lat: number, size: number) => [
  [lon, lat],
  [lon + size, lat],
  [lon + size, lat + size],
  [lon, lat + size],
  [lon, lat],
];
const west = { type: "Polygon", coordinates: [square(-120.35, 36.86, 0.01)] };
const east = { type: "Polygon", coordinates: [square(-120.34, 36.86, 0.01)] };
const holed = {
  type: "Polygon",
  coordinates: [square(-120.3, 36.9, 0.02), square(-120.295, 36.905, 0.005)],
};
const fields = [
  { id: "west", boundary: west, centroidLat: 36.865, centroidLon: -120.345 },
  { id: "east", boundary: east, centroidLat: 36.865, centroidLon: -120.335 },
  { id: "holed", boundary: holed, centroidLat: 36.91, centroidLon: -120.29 },
  { id: "no-shape", boundary: null, centroidLat: null, centroidLon: null },
];

describe("nearestField", () => {
  it("picks the field whose boundary holds the point, even when another centroid is nearer", () => {
    // Just inside the east edge of the west field: the east field's centroid is nearer.
    const hit = nearestField(fields, 36.865, -120.3401);
    expect(hit).toMatchObject({ id: "west", inside: true });
  });

  it("a point in a hole of a boundary is not inside it", () => {
    expect(pointInBoundary(holed, 36.9075, -120.2925)).toBe(false);
    expect(pointInBoundary(holed, 36.902, -120.298)).toBe(true);
    expect(
      pointInBoundary({ type: "MultiPolygon", coordinates: [holed.coordinates] }, 36.902, -120.298),
    ).toBe(true);
  });

  it("outside every field: the nearest centroid, with its distance", () => {
    const hit = nearestField(fields, 36.85, -120.335);
    expect(hit?.id).toBe("east");
    expect(hit?.inside).toBe(false);
    // 0.015° of latitude ≈ 1,668 m (haversine on R = 6,371 km: 2πR/360 = 111,195 m per degree, arith).
    expect(hit?.distanceM).toBeCloseTo(0.015 * 111_194.9, -1);
  });

  it("no field with a shape or a centroid: null", () => {
    expect(nearestField([fields[3]!], 36.86, -120.34)).toBeNull();
    expect(nearestField([], 36.86, -120.34)).toBeNull();
    expect(pointInBoundary({ type: "Point", coordinates: [1, 2] }, 2, 1)).toBe(false);
  });

  it("one degree of latitude is about 111.2 km (R = 6,371 km, arith)", () => {
    expect(distanceMeters(36, -120, 37, -120)).toBeCloseTo(111_194.9, 0);
  });
});
