import type { Metadata } from "next";
import Link from "next/link";
import { getFormatter, getTranslations } from "next-intl/server";
import {
  Pagination,
  ParamIssues,
  PlainHeader,
  SelectFilterInput,
  SortableHeader,
  TableShell,
} from "@/app/(office)/_components/data-table";
import { FilterForm } from "@/app/(office)/_components/data-table";
import {
  CASE_SEVERITIES,
  CASE_STATUSES,
  caseTableSpec,
  listCaseFilterOptions,
  listCases,
} from "@/db/queries/case-view";
import { requirePageUser } from "@/lib/auth/session";
import { parseTableQuery, type SearchParams, tableHref } from "@/lib/tables/params";
import { SeverityBadge, StatusBadge } from "./_components/badges";

export const metadata: Metadata = { title: "Injury cases" };

const BASE = "/cases";

export default async function CasesPage({ searchParams }: { searchParams: Promise<SearchParams> }) {
  // Growers have no queue: they open a case shared with them from its link.
  const user = await requirePageUser(["supervisor", "rep", "admin"]);
  const t = await getTranslations("cases");
  const format = await getFormatter();
  const query = parseTableQuery(await searchParams, caseTableSpec);
  const [list, options] = await Promise.all([listCases(user, query), listCaseFilterOptions(user)]);
  const f = query.filters;
  const all = CASE_STATUSES.reduce((sum, s) => sum + list.counts[s], 0);
  const exportHref = tableHref("/api/cases/export", query, { page: 1 });
  const intro =
    user.role === "supervisor" ? "introSupervisor" : user.role === "rep" ? "introRep" : "introAdmin";

  const chip = (active: boolean) =>
    `inline-flex min-h-tap items-center rounded-full border-2 px-4 font-semibold ${
      active ? "border-soil-900 bg-soil-900 text-white" : "border-soil-500 bg-white hover:bg-soil-100"
    }`;

  return (
    <section aria-labelledby="cases-heading" className="space-y-4">
      <h1 id="cases-heading">{t("queue.title")}</h1>
      <p className="text-soil-700">{t(`queue.${intro}`)}</p>

      <nav aria-label={t("queue.chips")}>
        <ul className="flex flex-wrap gap-2">
          <li>
            <Link
              href={tableHref(BASE, query, { filters: { status: undefined } })}
              className={chip(!f.status)}
              aria-current={!f.status ? "page" : undefined}
            >
              {t("queue.allStatuses", { count: all })}
            </Link>
          </li>
          {CASE_STATUSES.map((s) => (
            <li key={s}>
              <Link
                href={tableHref(BASE, query, { filters: { status: s } })}
                className={chip(f.status === s)}
                aria-current={f.status === s ? "page" : undefined}
              >
                {t("queue.chip", { status: t(`status.${s}`), count: list.counts[s] })}
              </Link>
            </li>
          ))}
        </ul>
      </nav>

      <ParamIssues issues={query.issues} />

      <FilterForm base={BASE} query={query} label={t("queue.filters")}>
        <SelectFilterInput
          name="status"
          label={t("queue.filter.status")}
          value={f.status}
          anyLabel={t("queue.any")}
          options={CASE_STATUSES.map((s) => ({ value: s, label: t(`status.${s}`) }))}
        />
        <SelectFilterInput
          name="severity"
          label={t("queue.filter.severity")}
          value={f.severity}
          anyLabel={t("queue.any")}
          options={CASE_SEVERITIES.map((s) => ({ value: s, label: t(`severity.${s}`) }))}
        />
        <SelectFilterInput
          name="account"
          label={t("queue.filter.account")}
          value={f.account}
          anyLabel={t("queue.any")}
          options={options.accounts.map((a) => ({ value: a.id, label: a.name }))}
        />
        <SelectFilterInput
          name="rep"
          label={t("queue.filter.rep")}
          value={f.rep}
          anyLabel={t("queue.any")}
          options={options.reps.map((r) => ({ value: r.id, label: r.name }))}
        />
        <SelectFilterInput
          name="hybrid"
          label={t("queue.filter.hybrid")}
          value={f.hybrid}
          anyLabel={t("queue.any")}
          options={options.hybrids.map((h) => ({ value: h, label: h }))}
        />
        <AgeInput name="minAge" label={t("queue.filter.minAge")} value={f.minAge} />
        <AgeInput name="maxAge" label={t("queue.filter.maxAge")} value={f.maxAge} />
      </FilterForm>

      <p>
        <a className="btn-secondary" href={exportHref} download>
          {t("queue.exportCsv")}
        </a>
      </p>

      <TableShell
        caption={t("queue.caption")}
        isEmpty={list.rows.length === 0}
        empty={<p>{all === 0 && !f.status ? t("queue.emptyAll") : t("queue.empty")}</p>}
      >
        <thead className="bg-soil-100">
          <tr>
            <SortableHeader label={t("queue.columns.opened")} column="opened" query={query} base={BASE} />
            <SortableHeader label={t("queue.columns.severity")} column="severity" query={query} base={BASE} />
            <SortableHeader label={t("queue.columns.status")} column="status" query={query} base={BASE} />
            <SortableHeader label={t("queue.columns.account")} column="account" query={query} base={BASE} />
            <PlainHeader label={t("queue.columns.field")} />
            <SortableHeader label={t("queue.columns.rep")} column="rep" query={query} base={BASE} />
            <SortableHeader label={t("queue.columns.hybrid")} column="hybrid" query={query} base={BASE} />
            <PlainHeader label={t("queue.columns.assigned")} />
            <PlainHeader label={t("queue.columns.decision")} />
          </tr>
        </thead>
        <tbody>
          {list.rows.map((r) => (
            <tr key={r.id} className="border-t border-soil-200 align-top">
              <td className="px-3 py-2">
                <Link
                  href={`/cases/${r.id}`}
                  className="font-semibold text-water-700 underline"
                  aria-label={t("queue.open", { field: r.fieldName, account: r.accountName })}
                >
                  {format.dateTime(new Date(r.openedAt), { dateStyle: "medium" })}
                </Link>
                <span className="block text-sm text-soil-700">
                  {t("queue.ageDays", { count: r.ageDays })}
                </span>
              </td>
              <td className="px-3 py-2">
                <SeverityBadge severity={r.severity} />
              </td>
              <td className="px-3 py-2">
                <StatusBadge status={r.status} />
              </td>
              <td className="px-3 py-2">{r.accountName}</td>
              <td className="px-3 py-2">{r.fieldName}</td>
              <td className="px-3 py-2">{r.repName ?? t("queue.noRep")}</td>
              <td className="px-3 py-2">{r.hybrid ?? t("queue.noHybrid")}</td>
              <td className="px-3 py-2">{r.assignedToName ?? t("queue.unassigned")}</td>
              <td className="px-3 py-2">{r.decision ? t(`decision.${r.decision}`) : ""}</td>
            </tr>
          ))}
        </tbody>
      </TableShell>
      <Pagination query={query} base={BASE} total={list.total} label={t("queue.pages")} />
    </section>
  );
}

function AgeInput({ name, label, value }: { name: string; label: string; value?: number }) {
  const id = `filter-${name}`;
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <input
        id={id}
        name={name}
        type="number"
        inputMode="numeric"
        min={0}
        max={3650}
        step={1}
        defaultValue={value ?? ""}
        className="field-input"
      />
    </div>
  );
}
