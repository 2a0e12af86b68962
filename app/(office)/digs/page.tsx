import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { getFormatter, getTranslations } from "next-intl/server";
import {
  digTableSpec,
  listDigTable,
  listVisibleAccountOptions,
  listVisibleFieldOptions,
  listVisibleHybridOptions,
  listVisibleRepOptions,
} from "@/db/queries/tables";
import { requirePageUser } from "@/lib/auth/session";
import { stageOfCollars } from "@/lib/digs/assessment";
import { pageCount, parseTableQuery, type SearchParams, tableHref } from "@/lib/tables/params";
import {
  CheckboxFilterInput,
  DateFilterInput,
  FilterForm,
  Pagination,
  ParamIssues,
  SelectFilterInput,
  SortableHeader,
  TableShell,
} from "../_components/data-table";

export const metadata: Metadata = { title: "Digs" };

const BASE = "/digs";

export default async function DigsPage({ searchParams }: { searchParams: Promise<SearchParams> }) {
  const user = await requirePageUser();
  const t = await getTranslations("office.digs");
  const tc = await getTranslations("office.common");
  const tt = await getTranslations("office.table");
  const format = await getFormatter();
  const query = parseTableQuery(await searchParams, digTableSpec);
  const [{ rows, total }, accounts, fields, hybrids, reps] = await Promise.all([
    listDigTable(user, query),
    listVisibleAccountOptions(user),
    listVisibleFieldOptions(user, query.filters.accountId),
    listVisibleHybridOptions(user),
    listVisibleRepOptions(user),
  ]);
  // A page past the end (rows were removed, or a hand-made link) goes to the last page.
  if (rows.length === 0 && query.page > pageCount(total, query.pageSize)) {
    redirect(tableHref(BASE, query, { page: pageCount(total, query.pageSize) }));
  }
  const f = query.filters;
  const showCase = user.role !== "grower";
  const sortable = (column: (typeof digTableSpec.sorts)[number], align?: "right") => (
    <SortableHeader
      label={t(`col.${column}`)}
      column={column}
      query={query}
      base={BASE}
      align={align}
      firstDir={column === "date" || column === "rootIndex" || column === "flags" ? "desc" : "asc"}
    />
  );

  return (
    <section aria-labelledby="digs-heading" className="space-y-4">
      <h1 id="digs-heading">{t("title")}</h1>
      <p className="text-soil-700">{t("intro")}</p>
      <ParamIssues issues={query.issues} />
      <FilterForm base={BASE} query={query} label={t("filters")}>
        <DateFilterInput name="from" label={t("from")} value={f.from} />
        <DateFilterInput name="to" label={t("to")} value={f.to} />
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
          name="fieldId"
          label={t("field")}
          value={f.fieldId}
          options={fields}
          anyLabel={tt("any")}
        />
        <SelectFilterInput
          name="hybrid"
          label={t("hybrid")}
          value={f.hybrid}
          options={hybrids}
          anyLabel={tt("any")}
        />
        {reps.length > 1 ? (
          <SelectFilterInput
            name="repId"
            label={t("rep")}
            value={f.repId}
            options={reps}
            anyLabel={tt("any")}
          />
        ) : null}
        <CheckboxFilterInput name="flagged" label={t("flagged")} checked={f.flagged === true} />
      </FilterForm>
      <TableShell caption={t("caption")} isEmpty={rows.length === 0} empty={<p>{t("empty")}</p>}>
        <thead className="bg-soil-100">
          <tr>
            {sortable("date")}
            {sortable("field")}
            {sortable("account")}
            {sortable("rep")}
            {sortable("hybrid")}
            {sortable("stage")}
            {sortable("rootIndex", "right")}
            {sortable("flags")}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.id} className="border-t border-soil-200 align-top">
              <th scope="row" className="p-3 font-semibold">
                <Link className="underline" href={`/digs/${r.id}`}>
                  {format.dateTime(r.dugAt, { dateStyle: "medium", timeStyle: "short" })}
                </Link>
              </th>
              <td className="p-3">
                <Link className="underline" href={`/fields/${r.fieldId}`}>
                  {r.fieldName}
                </Link>
              </td>
              <td className="p-3">
                <Link className="underline" href={`/accounts/${r.accountId}`}>
                  {r.accountName}
                </Link>
              </td>
              <td className="p-3">{r.repName ?? tc("none")}</td>
              <td className="p-3">{r.hybrid ?? tc("none")}</td>
              <td className="p-3">{r.leafCollars === null ? tc("none") : stageOfCollars(r.leafCollars)}</td>
              <td className="p-3 text-right tabular-nums">
                {r.rootIndex === null ? tc("none") : format.number(r.rootIndex, { maximumFractionDigits: 1 })}
              </td>
              <td className="p-3">
                <span>{tc("flagCount", { count: r.flagCount })}</span>
                {r.flaggedByRep ? (
                  <span className="ml-2 rounded bg-burn-700 px-2 py-0.5 text-xs font-bold text-white">
                    {tc("flaggedByRep")}
                  </span>
                ) : null}
                {showCase && r.caseId && r.caseStatus ? (
                  <Link className="mt-1 block underline" href={`/cases/${r.caseId}`}>
                    {tc(`caseStatus.${r.caseStatus}`)}
                  </Link>
                ) : null}
              </td>
            </tr>
          ))}
        </tbody>
      </TableShell>
      <p className="text-sm text-soil-700">{t("timesUtc")}</p>
      <Pagination query={query} base={BASE} total={total} label={t("pages")} />
    </section>
  );
}
