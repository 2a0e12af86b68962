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
