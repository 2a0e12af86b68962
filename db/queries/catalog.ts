import "server-only";
import { db } from "../client";

export interface CatalogProduct {
  id: string;
  name: string;
  chemistry: string;
  form: "liquid" | "dry" | "gas";
  n: number;
  p2o5: number;
  k2o: number;
  s: number;
  lbPerGal: number | null;
  densitySource: string | null;
  saltIndex: number | null;
  saltIndexSource: string | null;
  containsUrea: boolean;
  containsThiosulfate: boolean;
}

// The active product catalog in the shape the agronomy core takes (grade in %).
export async function listCatalogProducts(): Promise<CatalogProduct[]> {
  return db
    .selectFrom("product")
    .select([
      "id",
      "name",
      "chemistry",
      "form",
      "gradeN as n",
      "gradeP2o5 as p2o5",
      "gradeK2o as k2o",
      "gradeS as s",
      "lbPerGal",
      "densitySource",
      "saltIndex",
      "saltIndexSource",
      "containsUrea",
      "containsThiosulfate",
    ])
    .where("active", "=", true)
    .orderBy("name")
    .execute();
}
