import type { Metadata } from "next";
import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { listAdminAccounts } from "@/db/queries/admin-accounts";
import { listRegionOptions } from "@/db/queries/regions";
import { ADMIN_PAGE_SIZE, accountFilterSchema, parseSearchParams } from "@/lib/admin/schemas";
import { requirePageUser } from "@/lib/auth/session";
import { Cell } from "../_components/cell";
import { Pagination } from "../_components/pagination";
import { CreateAccountForm } from "./_components/account-forms";

export async function generateMetadata(): Promise<Metadata> {
  const t = await getTranslations("admin.accounts");
  return { title: t("title") };
}

type SearchParams = Promise<Record<string, string | string[] | undefined>>;

export default async function AccountsPage({ searchParams }: { searchParams: SearchParams }) {
  await requirePageUser(["admin"]);
  const filter = parseSearchParams(accountFilterSchema, await searchParams);
  const [regions, { accounts, total }] = await Promise.all([
    listRegionOptions(),
    listAdminAccounts({ ...filter, pageSize: ADMIN_PAGE_SIZE }),
  ]);
  const t = await getTranslations("admin.accounts");
  const filtered = Boolean(filter.q || filter.regionId);
  const names = (people: { name: string }[]) => (people.length ? people.map((p) => p.name).join(", ") : "—");

  return (
    <section aria-labelledby="accounts-heading" className="space-y-5">
      <h1 id="accounts-heading">{t("title")}</h1>

      <search aria-label={t("filters.label")}>
        <form
          key={JSON.stringify(filter)}
          method="get"
          action="/admin/accounts"
          className="card grid gap-4 sm:grid-cols-3"
        >
          <div className="sm:col-span-2">
            <label htmlFor="accounts-q" className="field-label">
              {t("filters.q")}
            </label>
            <input
              id="accounts-q"
              name="q"
              type="search"
              defaultValue={filter.q ?? ""}
              maxLength={100}
              autoComplete="off"
              className="field-input"
            />
          </div>
          <div>
            <label htmlFor="accounts-region" className="field-label">
              {t("filters.region")}
            </label>
            <select
              id="accounts-region"
              name="regionId"
              defaultValue={filter.regionId ?? ""}
              className="field-input"
            >
              <option value="">{t("filters.anyRegion")}</option>
              {regions.map((r) => (
                <option key={r.id} value={r.id}>
                  {r.name}
                </option>
              ))}
            </select>
          </div>
          <div className="flex flex-wrap gap-3 sm:col-span-3">
            <button type="submit" className="btn-primary">
              {t("filters.apply")}
            </button>
            {filtered ? (
              <Link href="/admin/accounts" className="btn-secondary">
                {t("filters.clear")}
              </Link>
            ) : null}
          </div>
        </form>
      </search>

      <p aria-live="polite">{t(filtered ? "countFiltered" : "count", { count: total })}</p>

      {accounts.length === 0 ? (
        <p className="notice-caution">{t(filtered ? "emptyFiltered" : "empty")}</p>
      ) : (
        <table className="block w-full text-left lg:table lg:rounded-card lg:border lg:border-soil-200 lg:bg-white">
          <caption className="sr-only">{t("caption")}</caption>
          <thead className="sr-only lg:not-sr-only lg:table-header-group lg:bg-soil-100">
            <tr>
              <th scope="col" className="p-3">
                {t("columns.name")}
              </th>
              <th scope="col" className="p-3">
                {t("columns.region")}
              </th>
              <th scope="col" className="p-3">
                {t("columns.locality")}
              </th>
              <th scope="col" className="p-3">
                {t("columns.reps")}
              </th>
              <th scope="col" className="p-3">
                {t("columns.growers")}
              </th>
              <th scope="col" className="p-3 lg:text-right">
                {t("columns.fields")}
              </th>
            </tr>
          </thead>
          <tbody className="block space-y-3 lg:table-row-group lg:space-y-0">
            {accounts.map((a) => (
              <tr
                key={a.id}
                className="card block lg:table-row lg:rounded-none lg:border-0 lg:border-t lg:shadow-none"
              >
                <th
                  scope="row"
                  className="block text-lg font-semibold lg:table-cell lg:p-3 lg:align-top lg:text-base"
                >
                  <Link href={`/admin/accounts/${a.id}`} className="text-water-700 underline">
                    {a.name}
                  </Link>
                </th>
                <Cell label={t("columns.region")}>{a.regionName}</Cell>
                <Cell label={t("columns.locality")}>{a.locality ?? "—"}</Cell>
                <Cell label={t("columns.reps")}>{names(a.reps)}</Cell>
                <Cell label={t("columns.growers")}>{names(a.growers)}</Cell>
                <Cell label={t("columns.fields")} className="lg:text-right">
                  {a.fieldCount}
                </Cell>
              </tr>
            ))}
          </tbody>
        </table>
      )}

      <Pagination
        basePath="/admin/accounts"
        params={{ q: filter.q, regionId: filter.regionId }}
        page={filter.page}
        pageSize={ADMIN_PAGE_SIZE}
        total={total}
      />

      <CreateAccountForm regions={regions} />
    </section>
  );
}
