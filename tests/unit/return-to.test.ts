import { describe, expect, it } from "vitest";
import { safeReturnPath } from "@/lib/auth/return-to";

// Open-redirect guard: only same-site paths survive (common practice, no source: browsers read
// "//host" and "/\host" as another origin).
describe("safeReturnPath", () => {
  it("keeps a path on this site with its query", () => {
    expect(safeReturnPath("/cases/2b1f0c3e-1111-4222-8333-944445555666")).toBe(
      "/cases/2b1f0c3e-1111-4222-8333-944445555666",
    );
    expect(safeReturnPath("/digs?flagged=1&page=2")).toBe("/digs?flagged=1&page=2");
  });

  it.each([
    ["another origin", "https://example.org/x"],
    ["protocol-relative", "//example.org/x"],
    ["backslash trick", "/\\example.org"],
    ["relative", "cases/1"],
    ["the sign-in page itself", "/sign-in?next=/"],
    ["an API route", "/api/map?bbox=1,2,3,4"],
    ["empty", ""],
    ["not a string", ["/a"]],
  ])("falls back to / for %s", (_, value) => {
    expect(safeReturnPath(value)).toBe("/");
  });
});
