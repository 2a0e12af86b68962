import "server-only";
import type { ProductCreate } from "@/lib/records/schemas";
import { db } from "../client";
import type { Product } from "../schema";

// The whole catalog, active products first, then by name.
export async function listProducts(): Promise<Product[]> {
  return db.selectFrom("product").selectAll().orderBy("active", "desc").orderBy("name").execute();
}

export async function findActiveProduct(id: string): Promise<Product | undefined> {
  return db
    .selectFrom("product")
    .selectAll()
    .where("id", "=", id)
    .where("active", "=", true)
    .executeTakeFirst();
}

// Undefined when a product of that name is already in the catalog.
export async function createProduct(product: ProductCreate): Promise<Product | undefined> {
  return db
    .insertInto("product")
    .values(product)
    .onConflict((oc) => oc.column("name").doNothing())
    .returningAll()
    .executeTakeFirst();
}

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
