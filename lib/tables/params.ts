import { z } from "zod";

// Server-side tables keep their state in the URL: sort, dir, page, pageSize and the filter fields.
// Bad values never throw: each falls back to its default and is reported in `issues`.

export type SearchParams = Record<string, string | string[] | undefined>;
export type SortDir = "asc" | "desc";

export const DEFAULT_PAGE_SIZES = [25, 50, 100] as const;
const MAX_PAGE = 100_000;

export interface TableSpec<S extends string, F extends z.ZodObject> {
  sorts: readonly S[];
  defaultSort: S;
  defaultDir: SortDir;
  // Every field should be optional; a value that fails its schema is dropped.
  filters: F;
  // The first one is the default.
  pageSizes?: readonly number[];
}

export interface TableParamIssue {
  param: string;
  message: string;
}

export interface TableQuery<S extends string = string, F = Record<string, unknown>> {
  sort: S;
  dir: SortDir;
  page: number;
  pageSize: number;
  filters: F;
  issues: TableParamIssue[];
  // What tableHref leaves out of a link because it is the default.
  defaults: { sort: S; dir: SortDir; pageSize: number };
  pageSizes: readonly number[];
}

// Common filter schemas: an empty field arrives as "" and counts as absent.
export const textFilter = z.string().trim().min(1).max(100);
export const uuidFilter = z.uuid();
export const dateFilter = z.iso.date();
export const flagFilter = z.enum(["1", "true", "on"]).transform(() => true as const);

function first(value: string | string[] | undefined): string | undefined {
  const v = Array.isArray(value) ? value[0] : value;
  return v === undefined || v.trim() === "" ? undefined : v;
}

export function parseTableQuery<S extends string, F extends z.ZodObject>(
  searchParams: SearchParams,
  spec: TableSpec<S, F>,
): TableQuery<S, z.output<F>> {
  const issues: TableParamIssue[] = [];
  const pageSizes = spec.pageSizes?.length ? spec.pageSizes : DEFAULT_PAGE_SIZES;
  const defaultPageSize = pageSizes[0] ?? 25;

  const rawSort = first(searchParams.sort);
  let sort = spec.defaultSort;
  if (rawSort !== undefined) {
    if ((spec.sorts as readonly string[]).includes(rawSort)) sort = rawSort as S;
    else issues.push({ param: "sort", message: `Unknown sort "${rawSort}".` });
  }

  const rawDir = first(searchParams.dir);
  let dir = spec.defaultDir;
  if (rawDir !== undefined) {
    if (rawDir === "asc" || rawDir === "desc") dir = rawDir;
    else issues.push({ param: "dir", message: "Direction is asc or desc." });
  }

  const rawPage = first(searchParams.page);
  let page = 1;
  if (rawPage !== undefined) {
    const n = Number(rawPage);
    if (Number.isInteger(n) && n >= 1 && n <= MAX_PAGE) page = n;
    else issues.push({ param: "page", message: "Page is a whole number from 1." });
  }

  const rawSize = first(searchParams.pageSize);
  let pageSize = defaultPageSize;
  if (rawSize !== undefined) {
    const n = Number(rawSize);
    if (pageSizes.includes(n)) pageSize = n;
    else issues.push({ param: "pageSize", message: `Page size is one of ${pageSizes.join(", ")}.` });
  }

  const raw: Record<string, string> = {};
  for (const key of Object.keys(spec.filters.shape)) {
    const v = first(searchParams[key]);
    if (v !== undefined) raw[key] = v;
  }
  // Drop the failing fields one round at a time, so one bad filter keeps the others.
  let filters: z.output<F> | undefined;
  for (let round = 0; round <= Object.keys(raw).length; round++) {
    const parsed = spec.filters.safeParse(raw);
    if (parsed.success) {
      filters = parsed.data;
      break;
    }
    const bad = new Set(parsed.error.issues.map((i) => String(i.path[0] ?? "")));
    for (const key of bad) {
      if (key in raw) {
        issues.push({ param: key, message: `"${raw[key]}" is not a valid value.` });
        delete raw[key];
      }
    }
    if (![...bad].some((k) => k !== "")) break;
  }
  if (filters === undefined) {
    const empty = spec.filters.safeParse({});
    filters = (empty.success ? empty.data : {}) as z.output<F>;
  }

  return {
    sort,
    dir,
    page,
    pageSize,
    filters,
    issues,
    defaults: { sort: spec.defaultSort, dir: spec.defaultDir, pageSize: defaultPageSize },
    pageSizes,
  };
}

export function pageCount(total: number, pageSize: number): number {
  return Math.max(1, Math.ceil(total / pageSize));
}

export function pageOffset(query: Pick<TableQuery, "page" | "pageSize">): number {
  return (query.page - 1) * query.pageSize;
}

export interface TableHrefPatch {
  sort?: string;
  dir?: SortDir;
  page?: number;
  pageSize?: number;
  // Merged over the current filters; a null/undefined/false/"" value removes that filter. `null`
  // for the whole object clears every filter.
  filters?: Record<string, unknown> | null;
}

function serialize(value: unknown): string | undefined {
  if (value === undefined || value === null || value === false || value === "") return undefined;
  if (value === true) return "1";
  if (value instanceof Date) return value.toISOString().slice(0, 10);
  return String(value);
}

// A link to the same table with some state changed. Any change other than the page goes back to
// page 1; defaults are left out so links stay short.
export function tableHref(
  base: string,
  current: Pick<TableQuery, "sort" | "dir" | "page" | "pageSize" | "filters" | "defaults">,
  patch: TableHrefPatch = {},
): string {
  const sort = patch.sort ?? current.sort;
  const dir = patch.dir ?? current.dir;
  const pageSize = patch.pageSize ?? current.pageSize;
  const resetsPage =
    patch.sort !== undefined || patch.dir !== undefined || patch.pageSize !== undefined || "filters" in patch;
  const page = patch.page ?? (resetsPage ? 1 : current.page);
  const filters =
    patch.filters === null
      ? {}
      : { ...(current.filters as Record<string, unknown>), ...(patch.filters ?? {}) };

  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(filters)) {
    const s = serialize(value);
    if (s !== undefined) params.set(key, s);
  }
  if (sort !== current.defaults.sort || dir !== current.defaults.dir) {
    params.set("sort", sort);
    params.set("dir", dir);
  }
  if (pageSize !== current.defaults.pageSize) params.set("pageSize", String(pageSize));
  if (page > 1) params.set("page", String(page));
  const qs = params.toString();
  return qs ? `${base}?${qs}` : base;
}
