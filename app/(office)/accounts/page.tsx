import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { getFormatter, getTranslations } from "next-intl/server";
import {
  accountTableSpec,
  listAccountTable,
  listGrownAccountIds,
  listVisibleRepOptions,
} from "@/db/queries/tables";
import { requirePageUser } from "@/lib/auth/session";
import { pageCount, parseTableQuery, type SearchParams, tableHref } from "@/lib/tables/params";
import {
  FilterForm,
  Pagination,
  ParamIssues,
  PlainHeader,
  SelectFilterInput,
  SortableHeader,
  TableShell,
  TextFilterInput,
} from "../_components/data-table";

export const metadata: Metadata = { title: "Accounts" };

const BASE = "/accounts";

export default async function AccountsPage({ searchParams }: { searchParams: Promise<SearchParams> }) {
  const user = await requirePageUser();
  if (user.role === "grower") {
    // A grower has a farm, not a list: go straight to it (the table below is scoped anyway).
    const own = await listGrownAccountIds(user.id);
    if (own.length === 1) redirect(`/accounts/${own[0]}`);
  }
  const t = await getTranslations("office.accounts");
  const tc = await getTranslations("office.common");
  const tt = await getTranslations("office.table");
  const format = await getFormatter();
  const query = parseTableQuery(await searchParams, accountTableSpec);
  const [{ rows, total }, reps] = await Promise.all([
    listAccountTable(user, query),
    listVisibleRepOptions(user),
  ]);
  // A page past the end (rows were removed, or a hand-made link) goes to the last page.
  if (rows.length === 0 && query.page > pageCount(total, query.pageSize)) {
    redirect(tableHref(BASE, query, { page: pageCount(total, query.pageSize) }));
  }
  const f = query.filters;
  const sortable = (column: (typeof accountTableSpec.sorts)[number], align?: "right") => (
    <SortableHeader
      label={t(`col.${column}`)}
      column={column}
      query={query}
      base={BASE}
      align={align}
      firstDir={align === "right" || column === "lastDig" ? "desc" : "asc"}
    />
  );

  return (
    <section aria-labelledby="accounts-heading" className="space-y-4">
      <h1 id="accounts-heading">{t("title")}</h1>
      <p className="text-soil-700">{t("intro")}</p>
      <ParamIssues issues={query.issues} />
      <FilterForm base={BASE} query={query} label={t("filters")}>
        <TextFilterInput name="q" label={t("q")} value={f.q} />
        {reps.length > 1 ? (
          <SelectFilterInput
            name="repId"
            label={t("rep")}
            value={f.repId}
            options={reps}
            anyLabel={tt("any")}
          />
        ) : null}
      </FilterForm>
      <TableShell caption={t("caption")} isEmpty={rows.length === 0} empty={<p>{t("empty")}</p>}>
        <thead className="bg-soil-100">
          <tr>
            {sortable("name")}
            {sortable("locality")}
            <PlainHeader label={t("col.reps")} />
            <PlainHeader label={t("col.growers")} />
            {sortable("fields", "right")}
            {sortable("digs", "right")}
            {sortable("openCases", "right")}
            {sortable("lastDig")}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.id} className="border-t border-soil-200 align-top">
              <th scope="row" className="p-3 font-semibold">
                <Link className="underline" href={`/accounts/${r.id}`}>
                  {r.name}
                </Link>
              </th>
              <td className="p-3">{r.locality ?? tc("none")}</td>
              <td className="p-3">{r.reps.length ? r.reps.join(", ") : tc("none")}</td>
              <td className="p-3">{r.growers.length ? r.growers.join(", ") : tc("none")}</td>
              <td className="p-3 text-right tabular-nums">
                <Link className="underline" href={`/fields?accountId=${r.id}`}>
                  {r.fieldCount}
                </Link>
              </td>
              <td className="p-3 text-right tabular-nums">
                <Link className="underline" href={`/digs?accountId=${r.id}`}>
                  {r.digCount}
                </Link>
              </td>
              <td className="p-3 text-right tabular-nums">{r.openCaseCount}</td>
              <td className="p-3">
                {r.lastDigAt ? format.dateTime(r.lastDigAt, { dateStyle: "medium" }) : tc("none")}
              </td>
            </tr>
          ))}
        </tbody>
      </TableShell>
      <Pagination query={query} base={BASE} total={total} label={t("pages")} />
    </section>
  );
}
