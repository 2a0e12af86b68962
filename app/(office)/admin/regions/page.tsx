import type { Metadata } from "next";
import { getTranslations } from "next-intl/server";
import { listRegions } from "@/db/queries/regions";
import { requirePageUser } from "@/lib/auth/session";
import { Cell } from "../_components/cell";
import { CreateRegionForm, RenameRegionForm } from "./_components/region-forms";

export async function generateMetadata(): Promise<Metadata> {
  const t = await getTranslations("admin.regions");
  return { title: t("title") };
}

export default async function RegionsPage() {
  await requirePageUser(["admin"]);
  const regions = await listRegions();
  const t = await getTranslations("admin.regions");
  return (
    <section aria-labelledby="regions-heading" className="space-y-5">
      <h1 id="regions-heading">{t("title")}</h1>
      <p className="text-soil-700">{t("intro")}</p>
      <CreateRegionForm />
      {regions.length === 0 ? (
        <p className="notice-caution">{t("empty")}</p>
      ) : (
        <table className="block w-full text-left lg:table lg:rounded-card lg:border lg:border-soil-200 lg:bg-white">
          <caption className="sr-only">{t("caption")}</caption>
          <thead className="sr-only lg:not-sr-only lg:table-header-group lg:bg-soil-100">
            <tr>
              <th scope="col" className="p-3">
                {t("columns.name")}
              </th>
              <th scope="col" className="p-3 lg:text-right">
                {t("columns.accounts")}
              </th>
              <th scope="col" className="p-3 lg:text-right">
                {t("columns.users")}
              </th>
              <th scope="col" className="p-3">
                {t("columns.rename")}
              </th>
            </tr>
          </thead>
          <tbody className="block space-y-3 lg:table-row-group lg:space-y-0">
            {regions.map((r) => (
              <tr
                key={r.id}
                className="card block lg:table-row lg:rounded-none lg:border-0 lg:border-t lg:shadow-none"
              >
                <th
                  scope="row"
                  className="block text-lg font-semibold lg:table-cell lg:p-3 lg:align-top lg:text-base"
                >
                  {r.name}
                </th>
                <Cell label={t("columns.accounts")} className="lg:text-right">
                  {r.accountCount}
                </Cell>
                <Cell label={t("columns.users")} className="lg:text-right">
                  {r.userCount}
                </Cell>
                <td className="block pt-3 align-top lg:table-cell lg:p-3">
                  <RenameRegionForm region={{ id: r.id, name: r.name }} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
