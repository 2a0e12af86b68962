import { NextResponse } from "next/server";
import { createProduct, listProducts } from "@/db/queries/products";
import { can } from "@/lib/auth/permissions";
import { authenticate, forbidden, handle, jsonError, parseJson } from "@/lib/http";
import { productCreateSchema } from "@/lib/records/schemas";

export const GET = handle("GET /api/products", async () => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  return NextResponse.json({ products: await listProducts() });
});

// Admins add a catalog product: chemistry and grade, never a brand, each published figure with its source.
export const POST = handle("POST /api/products", async (req) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  if (!can(auth.user, "write", { kind: "product" })) return forbidden();
  const body = await parseJson(req, productCreateSchema);
  if (!body.ok) return body.response;
  const product = await createProduct(body.data);
  if (!product) {
    return jsonError(409, `A product named "${body.data.name}" is already in the catalog.`, [
      { path: "name", message: "This name is already taken." },
    ]);
  }
  return NextResponse.json({ product }, { status: 201 });
});
