import Link from "next/link";
import { useTranslations } from "next-intl";
import type { ReactNode } from "react";
import { pageCount, type TableQuery, tableHref } from "@/lib/tables/params";

// Server-rendered table pieces whose state lives in the URL (lib/tables/params.ts). They work with
// JavaScript off; plain components, so a client component may render them too.

type Query = Pick<TableQuery, "sort" | "dir" | "page" | "pageSize" | "filters" | "defaults" | "pageSizes">;

export function TableShell({
  caption,
  captionHidden = false,
  empty,
  isEmpty,
  children,
  id,
}: {
  caption: string;
  captionHidden?: boolean;
  // Shown instead of the table when there are no rows.
  empty: ReactNode;
  isEmpty: boolean;
  // <thead> and <tbody>
  children: ReactNode;
  id?: string;
}) {
  if (isEmpty) {
    return (
      <div id={id} className="card text-soil-700" role="status">
        <p className="font-semibold text-soil-900">{caption}</p>
        <div className="mt-1">{empty}</div>
      </div>
    );
  }
  return (
    <section
      id={id}
      className="relative overflow-x-auto rounded-card border border-soil-200 bg-white"
      aria-label={caption}
      // biome-ignore lint/a11y/noNoninteractiveTabindex: a scrollable table must be reachable by keyboard
      tabIndex={0}
    >
      <table className="w-full min-w-[40rem] text-left text-sm md:text-base">
        <caption className={captionHidden ? "sr-only" : "p-3 text-left font-semibold"}>{caption}</caption>
        {children}
      </table>
    </section>
  );
}

export function SortableHeader({
  label,
  column,
  query,
  base,
  align = "left",
  firstDir = "asc",
}: {
  label: string;
  column: string;
  query: Query;
  base: string;
  align?: "left" | "right";
  // The direction a click on an unsorted column starts with.
  firstDir?: "asc" | "desc";
}) {
  const t = useTranslations("office.table");
  const active = query.sort === column;
  const nextDir = active ? (query.dir === "asc" ? "desc" : "asc") : firstDir;
  const href = tableHref(base, query, { sort: column, dir: nextDir });
  const ariaSort = active ? (query.dir === "asc" ? "ascending" : "descending") : undefined;
  return (
    <th scope="col" aria-sort={ariaSort} className={`p-0 ${align === "right" ? "text-right" : ""}`}>
      <Link
        href={href}
        className={`flex min-h-tap items-center gap-1 px-3 py-2 font-semibold hover:bg-soil-200 ${
          align === "right" ? "justify-end" : ""
        }`}
      >
        <span>{label}</span>
        <span aria-hidden="true" className={active ? "" : "text-soil-500"}>
          {active ? (query.dir === "asc" ? "▲" : "▼") : "↕"}
        </span>
        <span className="sr-only">
          {active
            ? t(query.dir === "asc" ? "sortedAsc" : "sortedDesc", { next: t(nextDir) })
            : t("sortBy", { dir: t(nextDir) })}
        </span>
      </Link>
    </th>
  );
}

export function PlainHeader({ label, align = "left" }: { label: string; align?: "left" | "right" }) {
  return (
    <th scope="col" className={`px-3 py-2 font-semibold ${align === "right" ? "text-right" : ""}`}>
      {label}
    </th>
  );
}

export function Pagination({
  query,
  base,
  total,
  label,
}: {
  query: Query;
  base: string;
  total: number;
  // e.g. "Digs pages"
  label: string;
}) {
  const t = useTranslations("office.table");
  const pages = pageCount(total, query.pageSize);
  const page = Math.min(query.page, pages);
  const linkClass = "btn-secondary min-w-tap px-3";
  const off = "btn-secondary min-w-tap px-3 opacity-50 cursor-not-allowed";
  return (
    <nav aria-label={label} className="mt-3 flex flex-wrap items-center gap-3">
      {page > 1 ? (
        <Link className={linkClass} href={tableHref(base, query, { page: page - 1 })} rel="prev">
          {t("previous")}
        </Link>
      ) : (
        <span className={off} aria-disabled="true">
          {t("previous")}
        </span>
      )}
      <p aria-live="polite">
        {t("pageOf", { page, pages })} · {t("total", { count: total })}
      </p>
      {page < pages ? (
        <Link className={linkClass} href={tableHref(base, query, { page: page + 1 })} rel="next">
          {t("next")}
        </Link>
      ) : (
        <span className={off} aria-disabled="true">
          {t("next")}
        </span>
      )}
      <ul className="ml-auto flex flex-wrap items-center gap-2" aria-label={t("pageSize")}>
        <li className="text-soil-700">{t("pageSize")}</li>
        {query.pageSizes.map((size) => (
          <li key={size}>
            {size === query.pageSize ? (
              <span
                className="inline-flex min-h-tap min-w-tap items-center justify-center rounded-card bg-soil-900 px-3 font-semibold text-white"
                aria-current="true"
              >
                {size}
              </span>
            ) : (
              <Link
                className="inline-flex min-h-tap min-w-tap items-center justify-center rounded-card border-2 border-soil-500 px-3 hover:bg-soil-100"
                href={tableHref(base, query, { pageSize: size })}
              >
                <span className="sr-only">{t("perPage")} </span>
                {size}
              </Link>
            )}
          </li>
        ))}
      </ul>
    </nav>
  );
}

// A GET form: the fields are children (labelled inputs named like the filter keys). Sorting and page
// size survive as hidden fields; applying goes back to page 1.
export function FilterForm({
  base,
  query,
  label,
  children,
}: {
  base: string;
  query: Query;
  label: string;
  children: ReactNode;
}) {
  const t = useTranslations("office.table");
  const keepSort = query.sort !== query.defaults.sort || query.dir !== query.defaults.dir;
  return (
    <form method="get" action={base} aria-label={label} className="card mb-4">
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">{children}</div>
      {keepSort ? (
        <>
          <input type="hidden" name="sort" value={query.sort} />
          <input type="hidden" name="dir" value={query.dir} />
        </>
      ) : null}
      {query.pageSize !== query.defaults.pageSize ? (
        <input type="hidden" name="pageSize" value={query.pageSize} />
      ) : null}
      <div className="mt-4 flex flex-wrap gap-3">
        <button type="submit" className="btn-primary">
          {t("apply")}
        </button>
        <Link className="btn-secondary" href={base}>
          {t("reset")}
        </Link>
      </div>
    </form>
  );
}

// Shown above a table when some URL values were ignored.
export function ParamIssues({ issues }: { issues: TableQuery["issues"] }) {
  const t = useTranslations("office.table");
  if (!issues.length) return null;
  return (
    <p className="notice-caution mb-4" role="status">
      {t("ignored", { params: issues.map((i) => i.param).join(", ") })}
    </p>
  );
}

// Labelled filter inputs for FilterForm; `name` is the filter key, `value` the parsed current value.
export function TextFilterInput({ name, label, value }: { name: string; label: string; value?: string }) {
  const id = `filter-${name}`;
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <input
        id={id}
        name={name}
        type="search"
        defaultValue={value ?? ""}
        maxLength={100}
        className="field-input"
      />
    </div>
  );
}

export function DateFilterInput({ name, label, value }: { name: string; label: string; value?: string }) {
  const id = `filter-${name}`;
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <input id={id} name={name} type="date" defaultValue={value ?? ""} className="field-input" />
    </div>
  );
}

export function SelectFilterInput({
  name,
  label,
  value,
  options,
  anyLabel,
}: {
  name: string;
  label: string;
  value?: string;
  options: readonly { value: string; label: string }[];
  anyLabel: string;
}) {
  const id = `filter-${name}`;
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select id={id} name={name} defaultValue={value ?? ""} className="field-input">
        <option value="">{anyLabel}</option>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );
}

export function CheckboxFilterInput({
  name,
  label,
  checked,
}: {
  name: string;
  label: string;
  checked?: boolean;
}) {
  const id = `filter-${name}`;
  return (
    <div className="flex items-end">
      <label htmlFor={id} className="flex min-h-tap items-center gap-3 font-semibold">
        <input
          id={id}
          name={name}
          type="checkbox"
          value="1"
          defaultChecked={checked ?? false}
          className="size-6"
        />
        {label}
      </label>
    </div>
  );
}
