import type { Metadata } from "next";
import Link from "next/link";
import { getFormatter, getTranslations } from "next-intl/server";
import { listUsers } from "@/db/queries/admin-users";
import { listRegionOptions } from "@/db/queries/regions";
import { ADMIN_PAGE_SIZE, parseSearchParams, USER_STATUSES, userFilterSchema } from "@/lib/admin/schemas";
import { requirePageUser } from "@/lib/auth/session";
import { ROLES } from "@/lib/auth/schemas";
import { Cell } from "../_components/cell";
import { Pagination } from "../_components/pagination";
import { UserManage } from "./_components/user-manage";

export async function generateMetadata(): Promise<Metadata> {
  const t = await getTranslations("admin.users");
  return { title: t("title") };
}

type SearchParams = Promise<Record<string, string | string[] | undefined>>;

const STATUS_STYLE = {
  active: "bg-sprout-100 text-sprout-900",
  invited: "bg-water-50 text-water-700",
  deactivated: "bg-soil-200 text-soil-900",
} as const;

export default async function UsersPage({ searchParams }: { searchParams: SearchParams }) {
  const actor = await requirePageUser(["admin"]);
  const filter = parseSearchParams(userFilterSchema, await searchParams);
  const [regions, { users, total }] = await Promise.all([
    listRegionOptions(),
    listUsers({ ...filter, pageSize: ADMIN_PAGE_SIZE }),
  ]);
  const t = await getTranslations("admin.users");
  const tc = await getTranslations("common");
  const format = await getFormatter();
  const filtered = Boolean(filter.q || filter.role || filter.regionId || filter.status);

  return (
    <section aria-labelledby="users-heading" className="space-y-5">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 id="users-heading">{t("title")}</h1>
        <Link href="/admin/users/invite" className="btn-primary">
          {t("invite")}
        </Link>
      </div>

      <search aria-label={t("filters.label")}>
        <form
          key={JSON.stringify(filter)}
          method="get"
          action="/admin/users"
          className="card grid gap-4 sm:grid-cols-2 lg:grid-cols-5"
        >
          <div className="sm:col-span-2 lg:col-span-2">
            <label htmlFor="users-q" className="field-label">
              {t("filters.q")}
            </label>
            <input
              id="users-q"
              name="q"
              type="search"
              defaultValue={filter.q ?? ""}
              maxLength={100}
              autoComplete="off"
              className="field-input"
            />
          </div>
          <div>
            <label htmlFor="users-role" className="field-label">
              {t("filters.role")}
            </label>
            <select id="users-role" name="role" defaultValue={filter.role ?? ""} className="field-input">
              <option value="">{t("filters.anyRole")}</option>
              {ROLES.map((r) => (
                <option key={r} value={r}>
                  {tc(`roles.${r}`)}
                </option>
              ))}
            </select>
          </div>
          <div>
            <label htmlFor="users-region" className="field-label">
              {t("filters.region")}
            </label>
            <select
              id="users-region"
              name="regionId"
              defaultValue={filter.regionId ?? ""}
              className="field-input"
            >
              <option value="">{t("filters.anyRegion")}</option>
              <option value="none">{t("filters.noRegion")}</option>
              {regions.map((r) => (
                <option key={r.id} value={r.id}>
                  {r.name}
                </option>
              ))}
            </select>
          </div>
          <div>
            <label htmlFor="users-status" className="field-label">
              {t("filters.status")}
            </label>
            <select
              id="users-status"
              name="status"
              defaultValue={filter.status ?? ""}
              className="field-input"
            >
              <option value="">{t("filters.anyStatus")}</option>
              {USER_STATUSES.map((s) => (
                <option key={s} value={s}>
                  {tc(`status.${s}`)}
                </option>
              ))}
            </select>
          </div>
          <div className="flex flex-wrap gap-3 sm:col-span-2 lg:col-span-5">
            <button type="submit" className="btn-primary">
              {t("filters.apply")}
            </button>
            {filtered ? (
              <Link href="/admin/users" className="btn-secondary">
                {t("filters.clear")}
              </Link>
            ) : null}
          </div>
        </form>
      </search>

      <p aria-live="polite">{t(filtered ? "countFiltered" : "count", { count: total })}</p>

      {users.length === 0 ? (
        <p className="notice-caution">{t(filtered ? "emptyFiltered" : "empty")}</p>
      ) : (
        <div className="lg:overflow-x-auto">
          <table className="block w-full text-left lg:table lg:rounded-card lg:border lg:border-soil-200 lg:bg-white">
            <caption className="sr-only">{t("caption")}</caption>
            <thead className="sr-only lg:not-sr-only lg:table-header-group lg:bg-soil-100">
              <tr>
                <th scope="col" className="p-3">
                  {t("columns.name")}
                </th>
                <th scope="col" className="p-3">
                  {t("columns.email")}
                </th>
                <th scope="col" className="p-3">
                  {t("columns.role")}
                </th>
                <th scope="col" className="p-3">
                  {t("columns.region")}
                </th>
                <th scope="col" className="p-3">
                  {t("columns.status")}
                </th>
                <th scope="col" className="p-3">
                  {t("columns.created")}
                </th>
                <th scope="col" className="p-3">
                  {t("columns.manage")}
                </th>
              </tr>
            </thead>
            <tbody className="block space-y-3 lg:table-row-group lg:space-y-0">
              {users.map((u) => (
                <tr
                  key={u.id}
                  className="card block lg:table-row lg:rounded-none lg:border-0 lg:border-t lg:shadow-none"
                >
                  <th
                    scope="row"
                    className="block text-lg font-semibold lg:table-cell lg:p-3 lg:align-top lg:text-base"
                  >
                    {u.name}
                  </th>
                  <Cell label={t("columns.email")}>
                    <span className="break-all lg:break-normal">{u.email}</span>
                  </Cell>
                  <Cell label={t("columns.role")}>{tc(`roles.${u.role}`)}</Cell>
                  <Cell label={t("columns.region")}>{u.regionName ?? t("noRegion")}</Cell>
                  <Cell label={t("columns.status")}>
                    <span className={`rounded px-2 py-0.5 text-sm font-semibold ${STATUS_STYLE[u.status]}`}>
                      {tc(`status.${u.status}`)}
                    </span>
                  </Cell>
                  <Cell label={t("columns.created")}>
                    {format.dateTime(u.createdAt, { year: "numeric", month: "short", day: "numeric" })}
                  </Cell>
                  <td className="block pt-3 align-top lg:table-cell lg:p-3">
                    <UserManage
                      user={{ id: u.id, name: u.name, role: u.role, regionId: u.regionId, status: u.status }}
                      roles={ROLES}
                      regions={regions}
                      isSelf={u.id === actor.id}
                    />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}

      <Pagination
        basePath="/admin/users"
        params={{ q: filter.q, role: filter.role, regionId: filter.regionId, status: filter.status }}
        page={filter.page}
        pageSize={ADMIN_PAGE_SIZE}
        total={total}
      />
    </section>
  );
}
