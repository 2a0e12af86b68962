import { describe, expect, it } from "vitest";
import { z } from "zod";
import {
  dateFilter,
  flagFilter,
  parseTableQuery,
  tableHref,
  textFilter,
  uuidFilter,
} from "@/lib/tables/params";

const spec = {
  sorts: ["date", "field", "rootIndex"] as const,
  defaultSort: "date" as const,
  defaultDir: "desc" as const,
  filters: z.object({
    q: textFilter.optional(),
    accountId: uuidFilter.optional(),
    from: dateFilter.optional(),
    flagged: flagFilter.optional(),
  }),
};
const ACCOUNT = "5b0c7f3e-1d1a-4c55-9a55-0e6b1f0c2a11";

describe("parseTableQuery", () => {
  it("uses the defaults for an empty query", () => {
    const q = parseTableQuery({}, spec);
    expect(q).toMatchObject({ sort: "date", dir: "desc", page: 1, pageSize: 25, filters: {}, issues: [] });
  });

  it("reads valid values, taking the first of repeated ones", () => {
    const q = parseTableQuery(
      {
        sort: "field",
        dir: "asc",
        page: "3",
        pageSize: "50",
        q: [" Alder ", "x"],
        accountId: ACCOUNT,
        flagged: "1",
      },
      spec,
    );
    expect(q.sort).toBe("field");
    expect(q.dir).toBe("asc");
    expect(q.page).toBe(3);
    expect(q.pageSize).toBe(50);
    expect(q.filters).toEqual({ q: "Alder", accountId: ACCOUNT, flagged: true });
    expect(q.issues).toEqual([]);
  });

  it("falls back on bad values one by one and reports each", () => {
    const q = parseTableQuery(
      {
        sort: "password",
        dir: "sideways",
        page: "-2",
        pageSize: "1000",
        accountId: "not-a-uuid",
        from: "2026-13-45",
        q: "kept",
      },
      spec,
    );
    expect(q).toMatchObject({ sort: "date", dir: "desc", page: 1, pageSize: 25 });
    expect(q.filters).toEqual({ q: "kept" });
    expect(q.issues.map((i) => i.param).sort()).toEqual([
      "accountId",
      "dir",
      "from",
      "page",
      "pageSize",
      "sort",
    ]);
  });

  it("treats blank fields as absent and rejects fractional pages", () => {
    const q = parseTableQuery({ q: "   ", accountId: "", page: "2.5" }, spec);
    expect(q.filters).toEqual({});
    expect(q.page).toBe(1);
    expect(q.issues.map((i) => i.param)).toEqual(["page"]);
  });

  it("honours a custom page-size list, its first entry the default", () => {
    const q = parseTableQuery({ pageSize: "10" }, { ...spec, pageSizes: [20, 10] });
    expect(q.pageSize).toBe(10);
    expect(parseTableQuery({}, { ...spec, pageSizes: [20, 10] }).pageSize).toBe(20);
  });
});

describe("tableHref", () => {
  it("leaves defaults out", () => {
    expect(tableHref("/digs", parseTableQuery({}, spec))).toBe("/digs");
  });

  it("keeps the state and changes only the page", () => {
    const q = parseTableQuery({ sort: "field", dir: "asc", page: "2", q: "Alder", flagged: "on" }, spec);
    const url = new URL(tableHref("/digs", q, { page: 3 }), "http://x");
    expect(Object.fromEntries(url.searchParams)).toEqual({
      q: "Alder",
      flagged: "1",
      sort: "field",
      dir: "asc",
      page: "3",
    });
  });

  it("goes back to page 1 on a new sort, page size or filter", () => {
    const q = parseTableQuery({ page: "4", q: "Alder" }, spec);
    expect(tableHref("/digs", q, { sort: "rootIndex", dir: "asc" })).toBe(
      "/digs?q=Alder&sort=rootIndex&dir=asc",
    );
    expect(tableHref("/digs", q, { pageSize: 100 })).toBe("/digs?q=Alder&pageSize=100");
    expect(tableHref("/digs", q, { filters: { q: null, accountId: ACCOUNT } })).toBe(
      `/digs?accountId=${ACCOUNT}`,
    );
    expect(tableHref("/digs", q, { filters: null })).toBe("/digs");
  });

  it("round-trips through parseTableQuery", () => {
    const q = parseTableQuery(
      { sort: "rootIndex", dir: "asc", page: "2", pageSize: "50", from: "2026-05-01" },
      spec,
    );
    const url = new URL(tableHref("/digs", q), "http://x");
    const again = parseTableQuery(Object.fromEntries(url.searchParams), spec);
    expect(again).toEqual(q);
  });
});
