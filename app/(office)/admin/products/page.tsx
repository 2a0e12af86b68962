import type { Metadata } from "next";
import { getTranslations } from "next-intl/server";
import { listProducts } from "@/db/queries/products";
import { requirePageUser } from "@/lib/auth/session";
import { ProductForm } from "./product-form";

export const metadata: Metadata = { title: "Products" };

const grade = (p: { gradeN: number; gradeP2o5: number; gradeK2o: number; gradeS: number }) =>
  [p.gradeN, p.gradeP2o5, p.gradeK2o].join("-") + (p.gradeS ? `-${p.gradeS}S` : "");

export default async function ProductsPage() {
  await requirePageUser(["admin"]);
  const t = await getTranslations("products");
  const products = await listProducts();
  return (
    <section aria-labelledby="products-heading" className="space-y-6">
      <div>
        <h1 id="products-heading">{t("title")}</h1>
        <p className="mt-1 text-soil-700">{t("intro")}</p>
      </div>
      {products.length === 0 ? (
        <p className="notice-caution">{t("empty")}</p>
      ) : (
        <section
          className="overflow-x-auto rounded-card border border-soil-200 bg-white"
          aria-label={t("title")}
          // biome-ignore lint/a11y/noNoninteractiveTabindex: a scrollable table must be reachable by keyboard
          tabIndex={0}
        >
          <table className="w-full text-left text-sm">
            <caption className="sr-only">{t("title")}</caption>
            <thead className="bg-soil-100">
              <tr>
                <th scope="col" className="p-3">
                  {t("table.name")}
                </th>
                <th scope="col" className="p-3">
                  {t("table.grade")}
                </th>
                <th scope="col" className="p-3">
                  {t("table.density")}
                </th>
                <th scope="col" className="p-3">
                  {t("table.saltIndex")}
                </th>
                <th scope="col" className="p-3">
                  {t("table.flags")}
                </th>
              </tr>
            </thead>
            <tbody>
              {products.map((p) => (
                <tr key={p.id} className="border-t border-soil-200 align-top">
                  <th scope="row" className="p-3 font-semibold">
                    {p.name}
                    <span className="block font-normal text-soil-700">{p.chemistry}</span>
                  </th>
                  <td className="p-3">{grade(p)}</td>
                  <td className="p-3">
                    {p.lbPerGal === null ? t("table.notApplicable") : `${p.lbPerGal} lb/gal`}
                    {p.densitySource ? <span className="block text-soil-700">{p.densitySource}</span> : null}
                  </td>
                  <td className="p-3">
                    {p.saltIndex === null ? t("table.none") : p.saltIndex}
                    {p.saltIndexSource ? (
                      <span className="block text-soil-700">{p.saltIndexSource}</span>
                    ) : null}
                  </td>
                  <td className="p-3">
                    {[
                      p.containsUrea ? t("table.urea") : null,
                      p.containsThiosulfate ? t("table.thiosulfate") : null,
                    ]
                      .filter(Boolean)
                      .join(", ") || t("table.none")}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      )}
      <ProductForm />
    </section>
  );
}
