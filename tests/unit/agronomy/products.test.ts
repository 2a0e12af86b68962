import { describe, expect, it } from "vitest";
import { FERTILIZER_PRODUCTS, findProduct, nutrientsPerAcre, partialSaltIndex } from "@/lib/agronomy";
import { SRC } from "./sources";

const byId = (id: string) => {
  const p = findProduct(id);
  if (!p) throw new Error(`missing product ${id}`);
  return p;
};

describe("FERTILIZER_PRODUCTS", () => {
  it("holds the generic products by chemistry and grade", () => {
    const names = FERTILIZER_PRODUCTS.map((p) => p.name);
    for (const wanted of [
      "ammonium polyphosphate 10-34-0",
      "UAN-32 (urea ammonium nitrate 32-0-0)",
      "UAN-28 (urea ammonium nitrate 28-0-0)",
      "ammonium thiosulfate 12-0-0-26S",
      "potassium thiosulfate 0-0-25-17S",
      "urea 46-0-0",
      "anhydrous ammonia 82-0-0",
      "monoammonium phosphate 11-52-0",
      "diammonium phosphate 18-46-0",
      "potassium chloride 0-0-60",
      "ammonium sulfate 21-0-0-24S",
    ]) {
      expect(names).toContain(wanted);
    }
    expect(new Set(FERTILIZER_PRODUCTS.map((p) => p.id)).size).toBe(FERTILIZER_PRODUCTS.length);
  });

  it("the grade in each name matches the grade fields", () => {
    for (const p of FERTILIZER_PRODUCTS) {
      const grade = /(\d+)-(\d+)-(\d+)(?:-(\d+)S)?/.exec(p.name);
      expect(grade, p.name).not.toBeNull();
      expect([p.n, p.p2o5, p.k2o, p.s], p.name).toEqual([
        Number(grade?.[1]),
        Number(grade?.[2]),
        Number(grade?.[3]),
        Number(grade?.[4] ?? 0),
      ]);
    }
  });

  it(`densities: UAN-28 10.67 and UAN-30 10.90 lb/gal — ${SRC.vceDensity}`, () => {
    expect(byId("uan-28").lbPerGal).toBe(10.67);
    expect(byId("uan-30").lbPerGal).toBe(10.9);
  });

  it(`densities: UAN-32 11.06, 10-34-0 11.65, ammonium thiosulfate 11.04 lb/gal — ${SRC.industrySheet}`, () => {
    expect(byId("uan-32").lbPerGal).toBe(11.06);
    expect(byId("ammonium-polyphosphate-10-34-0").lbPerGal).toBe(11.65);
    expect(byId("ammonium-thiosulfate-12-0-0-26s").lbPerGal).toBe(11.04);
  });

  it(`salt indexes (sodium nitrate = 100) — ${SRC.rader1943}`, () => {
    expect(byId("ammonium-nitrate-34-0-0").saltIndex).toBeCloseTo(104.7, 1);
    expect(byId("urea-46-0-0").saltIndex).toBeCloseTo(75.4, 1);
    expect(byId("anhydrous-ammonia-82-0-0").saltIndex).toBeCloseTo(47.1, 1);
    expect(byId("potassium-chloride-0-0-60").saltIndex).toBeCloseTo(116.3, 1);
    expect(byId("monoammonium-phosphate-11-52-0").saltIndex).toBeCloseTo(29.9, 1);
    expect(byId("diammonium-phosphate-18-46-0").saltIndex).toBeCloseTo(34.2, 1);
  });

  it(`partial salt index of potassium chloride ≈ 116.3 ÷ 60 = 1.94 per unit — arithmetic on ${SRC.rader1943}`, () => {
    expect(partialSaltIndex(byId("potassium-chloride-0-0-60"))).toBeCloseTo(1.938, 3);
    expect(partialSaltIndex(byId("uan-32"))).toBeNull();
  });

  it(`urea and thiosulfate flags — ${SRC.kStateStarter}`, () => {
    const urea = FERTILIZER_PRODUCTS.filter((p) => p.containsUrea).map((p) => p.id);
    expect(urea.sort()).toEqual(["uan-28", "uan-30", "uan-32", "urea-46-0-0"]);
    const thio = FERTILIZER_PRODUCTS.filter((p) => p.containsThiosulfate).map((p) => p.id);
    expect(thio.sort()).toEqual(["ammonium-thiosulfate-12-0-0-26s", "potassium-thiosulfate-0-0-25-17s"]);
  });

  it("every density and salt index has a source note with a confidence, and memory values say so", () => {
    for (const p of FERTILIZER_PRODUCTS) {
      const props = p.sources.map((s) => s.property);
      expect(props, p.name).toContain("grade");
      if (p.lbPerGal !== null) expect(props, p.name).toContain("lbPerGal");
      expect(props, p.name).toContain("saltIndex");
      for (const s of p.sources) {
        expect(["read", "quoted", "arith", "memory", "common practice, no source"]).toContain(s.confidence);
        if (s.property === "saltIndex" && p.saltIndex !== null) expect(s.confidence).toBe("memory");
      }
      if (p.form !== "solid") expect(p.lbPerGal, p.name).not.toBeNull();
    }
  });

  it("every product works in nutrientsPerAcre (liquids by the gallon, solids by the pound)", () => {
    for (const p of FERTILIZER_PRODUCTS) {
      const r = p.lbPerGal === null ? nutrientsPerAcre(p, 100, "lb/ac") : nutrientsPerAcre(p, 10, "gal/ac");
      expect(r.n + r.p2o5 + r.k2o + r.s, p.name).toBeGreaterThan(0);
    }
  });
});
