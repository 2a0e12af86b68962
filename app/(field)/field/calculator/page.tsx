import type { Metadata } from "next";
import { getTranslations } from "next-intl/server";
import { listCatalogProducts } from "@/db/queries/products";
import { requirePageUser } from "@/lib/auth/session";
import { Calculator } from "./_components/calculator";

export const metadata: Metadata = { title: "Calculator" };

export default async function CalculatorPage() {
  await requirePageUser(["rep", "supervisor", "admin"]);
  const t = await getTranslations("field.calculator");
  const products = await listCatalogProducts();
  return (
    <>
      <h1>{t("title")}</h1>
      <p className="mt-1 mb-4 text-soil-700">{t("intro")}</p>
      <Calculator products={products} />
      <p className="mt-6 text-sm text-soil-700">{t("guidance")}</p>
    </>
  );
}
