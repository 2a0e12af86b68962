import "server-only";
import type { Kysely } from "kysely";
import { FERTILIZER_PRODUCTS, type FertilizerProduct, type SourceNote } from "@/lib/agronomy";
import type { Database, NewProduct } from "../schema";
import { demoId, SEED_VERSION } from "./ids";

const FORM: Record<FertilizerProduct["form"], NewProduct["form"]> = {
  liquid: "liquid",
  solid: "dry",
  "pressurized liquid": "gas",
};

function sourceText(notes: readonly SourceNote[], property: SourceNote["property"]): string | null {
  const lines = notes
    .filter((n) => n.property === property)
    .map((n) => `${n.source} (${n.confidence})${n.note ? `: ${n.note}` : ""}`);
  return lines.length > 0 ? lines.join("; ") : null;
}

/** The product row of a catalog product. */
export function productRow(p: FertilizerProduct): NewProduct & { id: string } {
  return {
    id: demoId("product", p.id),
    name: p.name,
    chemistry: p.chemistry,
    form: FORM[p.form],
    gradeN: p.n,
    gradeP2o5: p.p2o5,
    gradeK2o: p.k2o,
    gradeS: p.s,
    lbPerGal: p.lbPerGal,
    densitySource: p.lbPerGal === null ? null : sourceText(p.sources, "lbPerGal"),
    saltIndex: p.saltIndex,
    saltIndexSource: sourceText(p.sources, "saltIndex"),
    containsUrea: p.containsUrea,
    containsThiosulfate: p.containsThiosulfate,
    version: SEED_VERSION,
  };
}

/** Inserts the generic product catalog; returns product ids by catalog id. */
export async function seedProducts(db: Kysely<Database>): Promise<Map<string, string>> {
  const rows = FERTILIZER_PRODUCTS.map(productRow);
  await db.insertInto("product").values(rows).execute();
  return new Map(FERTILIZER_PRODUCTS.map((p, i) => [p.id, rows[i]!.id]));
}
