import { createFormatter, createTranslator } from "next-intl";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it, vi } from "vitest";
import messages from "@/lib/i18n/messages/en/fieldPage.json";

// The panels' server components render with the real catalog: the digs chart and the comparison.
vi.mock("next-intl/server", () => ({
  getTranslations: async (namespace: string) =>
    createTranslator({
      locale: "en",
      messages: { fieldPage: messages },
      namespace: namespace as "fieldPage",
    }),
  getFormatter: async () => createFormatter({ locale: "en", timeZone: "UTC" }),
}));

const { DigsPanel } = await import("@/app/(office)/fields/[fieldId]/_panels/digs-panel");
const { HybridStatsPanel } = await import("@/app/(office)/fields/[fieldId]/_panels/hybrid-stats-panel");
const { compareHybrids } = await import("@/app/(office)/fields/[fieldId]/_panels/hybrid-stats");

const digs = [
  { id: "d1", dugAt: new Date("2026-05-10T15:00:00Z"), rootIndex: 71.5, hybrid: "Strip A", plantCount: 5 },
  { id: "d2", dugAt: new Date("2026-05-12T15:00:00Z"), rootIndex: 68, hybrid: "Strip A", plantCount: 5 },
  { id: "d3", dugAt: new Date("2026-05-10T16:00:00Z"), rootIndex: 52, hybrid: "Strip B", plantCount: 4 },
  { id: "d4", dugAt: new Date("2026-05-12T16:00:00Z"), rootIndex: 49.5, hybrid: "Strip B", plantCount: 5 },
  { id: "d5", dugAt: new Date("2026-05-13T16:00:00Z"), rootIndex: 60, hybrid: null, plantCount: 3 },
];

describe("field panels render", () => {
  it("draws one marker per dig, a text legend with shapes and a table", async () => {
    const html = renderToStaticMarkup(await DigsPanel({ digs, headingId: "h" }));
    expect(html).toContain(
      '<title id="h-title">Root development index of each dig by date, one series per hybrid</title>',
    );
    expect(html).toContain("Circle: No planting recorded (1 dig)");
    expect(html).toContain("Square: Strip A (2 digs)");
    expect(html).toContain("Triangle: Strip B (2 digs)");
    expect(html.match(/<tr class="border-t/g)).toHaveLength(5);
    expect(html).toContain(">71.5<");
  });

  it("words a clear difference with its numbers and the small-n caveat", async () => {
    const html = renderToStaticMarkup(await HybridStatsPanel({ comparison: compareHybrids(digs) }));
    // 19.0 is the difference of the fixture means worked by hand; "clear" is Welch's p < 0.05, the test
    // itself checked against R's sleep-data example in field-panels.test.ts (from memory).
    expect(html).toContain(
      "Strip A scored 19.0 points higher than Strip B: the difference is statistically clear at 5 %.",
    );
    expect(html).toContain("Welch&#x27;s t = ");
    expect(html).toContain("Few digs");
  });
});
