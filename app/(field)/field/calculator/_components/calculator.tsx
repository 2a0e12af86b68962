"use client";

import { useTranslations } from "next-intl";
import { useState } from "react";
import type { CatalogProduct } from "@/db/queries/products";
import { FertilizerCalculator } from "./fertilizer-calculator";
import { GddCalculator } from "./gdd-calculator";
import { NitrogenCalculator } from "./nitrogen-calculator";
import { StandCalculator } from "./stand-calculator";
import { YieldCalculator } from "./yield-calculator";

const TOOLS = ["stand", "gdd", "fertilizer", "nitrogen", "yield"] as const;
type Tool = (typeof TOOLS)[number];

// One tool at a time behind large tabs: fits a phone held in one hand. Everything computes on the
// device, so it works offline once the page has been loaded.
export function Calculator({ products }: { products: CatalogProduct[] }) {
  const t = useTranslations("field.calculator");
  const [tool, setTool] = useState<Tool>("stand");
  return (
    <div>
      <div
        role="tablist"
        aria-label={t("tools")}
        className="-mx-gutter flex gap-2 overflow-x-auto px-gutter pb-2"
      >
        {TOOLS.map((key) => (
          <button
            key={key}
            id={`tab-${key}`}
            type="button"
            role="tab"
            aria-selected={tool === key}
            aria-controls={`panel-${key}`}
            onClick={() => setTool(key)}
            onKeyDown={(e) => {
              const i = TOOLS.indexOf(key);
              const next =
                e.key === "ArrowRight"
                  ? TOOLS[(i + 1) % TOOLS.length]
                  : e.key === "ArrowLeft"
                    ? TOOLS[(i + TOOLS.length - 1) % TOOLS.length]
                    : null;
              if (next) {
                setTool(next);
                document.getElementById(`tab-${next}`)?.focus();
              }
            }}
            tabIndex={tool === key ? 0 : -1}
            className={`min-h-tap shrink-0 rounded-full border-2 px-4 font-bold ${
              tool === key
                ? "border-sprout-900 bg-sprout-900 text-white"
                : "border-soil-500 bg-white text-soil-900"
            }`}
          >
            {t(`tabs.${key}`)}
          </button>
        ))}
      </div>
      {TOOLS.map((key) => (
        <section
          key={key}
          id={`panel-${key}`}
          role="tabpanel"
          aria-labelledby={`tab-${key}`}
          hidden={tool !== key}
          className="mt-3"
        >
          <h2 className="mb-3">{t(`headings.${key}`)}</h2>
          {key === "stand" ? <StandCalculator /> : null}
          {key === "gdd" ? <GddCalculator /> : null}
          {key === "fertilizer" ? <FertilizerCalculator products={products} /> : null}
          {key === "nitrogen" ? <NitrogenCalculator /> : null}
          {key === "yield" ? <YieldCalculator /> : null}
        </section>
      ))}
    </div>
  );
}
