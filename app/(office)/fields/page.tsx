import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { getFormatter, getTranslations } from "next-intl/server";
import {
  fieldTableSpec,
  listFieldTable,
  listVisibleAccountOptions,
  listVisibleHybridOptions,
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

export const metadata: Metadata = { title: "Fields" };

const BASE = "/fields";

export default async function FieldsPage({ searchParams }: { searchParams: Promise<SearchParams> }) {
  const user = await requirePageUser();
  const t = await getTranslations("office.fields");
  const tc = await getTranslations("office.common");
  const tt = await getTranslations("office.table");
  const format = await getFormatter();
  const query = parseTableQuery(await searchParams, fieldTableSpec);
  const [{ rows, total }, accounts, hybrids] = await Promise.all([
    listFieldTable(user, query),
    listVisibleAccountOptions(user),
    listVisibleHybridOptions(user),
  ]);
  // A page past the end (rows were removed, or a hand-made link) goes to the last page.
  if (rows.length === 0 && query.page > pageCount(total, query.pageSize)) {
    redirect(tableHref(BASE, query, { page: pageCount(total, query.pageSize) }));
  }
  const f = query.filters;
  const sortable = (column: (typeof fieldTableSpec.sorts)[number], align?: "right") => (
    <SortableHeader
      label={t(`col.${column}`)}
      column={column}
      query={query}
      base={BASE}
      align={align}
      firstDir={align === "right" ? "desc" : "asc"}
    />
  );

  return (
    <section aria-labelledby="fields-heading" className="space-y-4">
      <h1 id="fields-heading">{t("title")}</h1>
      <p className="text-soil-700">{t("intro")}</p>
      <ParamIssues issues={query.issues} />
      <FilterForm base={BASE} query={query} label={t("filters")}>
        <TextFilterInput name="q" label={t("q")} value={f.q} />
        {accounts.length > 1 ? (
          <SelectFilterInput
            name="accountId"
            label={t("account")}
            value={f.accountId}
            options={accounts}
            anyLabel={tt("any")}
          />
        ) : null}
        <SelectFilterInput
          name="hybrid"
          label={t("hybrid")}
          value={f.hybrid}
          options={hybrids}
          anyLabel={tt("any")}
        />
      </FilterForm>
      <TableShell caption={t("caption")} isEmpty={rows.length === 0} empty={<p>{t("empty")}</p>}>
        <thead className="bg-soil-100">
          <tr>
            {sortable("name")}
            {sortable("account")}
            {sortable("area", "right")}
            <PlainHeader label={t("col.hybrids")} />
            {sortable("planted")}
            {sortable("digs", "right")}
            {sortable("lastRootIndex", "right")}
            {sortable("flagged", "right")}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.id} className="border-t border-soil-200 align-top">
              <th scope="row" className="p-3 font-semibold">
                <Link className="underline" href={`/fields/${r.id}`}>
                  {r.name}
                </Link>
              </th>
              <td className="p-3">
                <Link className="underline" href={`/accounts/${r.accountId}`}>
                  {r.accountName}
                </Link>
              </td>
              <td className="p-3 text-right tabular-nums">
                {r.areaAcres === null
                  ? tc("none")
                  : tc("acres", { value: format.number(r.areaAcres, { maximumFractionDigits: 1 }) })}
              </td>
              <td className="p-3">{r.hybrids.length ? r.hybrids.join(", ") : tc("none")}</td>
              <td className="p-3">
                {r.plantedOn
                  ? format.dateTime(new Date(`${r.plantedOn}T00:00:00Z`), { dateStyle: "medium" })
                  : tc("none")}
              </td>
              <td className="p-3 text-right tabular-nums">
                {r.digCount > 0 ? (
                  <Link className="underline" href={`/digs?fieldId=${r.id}`}>
                    {r.digCount}
                  </Link>
                ) : (
                  0
                )}
              </td>
              <td className="p-3 text-right tabular-nums">
                {r.lastRootIndex === null
                  ? tc("none")
                  : format.number(r.lastRootIndex, { maximumFractionDigits: 1 })}
              </td>
              <td className="p-3 text-right tabular-nums">
                {r.flaggedCount > 0 ? (
                  <Link className="underline" href={`/digs?fieldId=${r.id}&flagged=1`}>
                    {r.flaggedCount}
                  </Link>
                ) : (
                  0
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </TableShell>
      <Pagination query={query} base={BASE} total={total} label={t("pages")} />
    </section>
  );
}
