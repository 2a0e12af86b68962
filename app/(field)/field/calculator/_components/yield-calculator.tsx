"use client";

import { grainYieldEstimate } from "@/lib/agronomy";
import { useTranslations } from "next-intl";
import { useState } from "react";
import { BigNumber, compute, fmt, NumberField, parseNumberEntry, ResultPanel } from "./form-fields";

const EARS = { min: 0, max: 100, unit: "ears", integer: true } as const;
const ROWS = { min: 4, max: 30, unit: "rows", integer: true } as const;
const KERNELS = { min: 0, max: 80, unit: "kernels" } as const;
const FACTOR = { min: 60, max: 120, unit: "kernels/bu ÷ 1000", optional: true } as const;

export function YieldCalculator() {
  const t = useTranslations("field.calculator.yield");
  const te = useTranslations("field.calculator.errors");
  const [ears, setEars] = useState("");
  const [rows, setRows] = useState("");
  const [kernels, setKernels] = useState("");
  const [factor, setFactor] = useState("90");

  const e = parseNumberEntry(ears, EARS, te);
  const r = parseNumberEntry(rows, ROWS, te);
  const k = parseNumberEntry(kernels, KERNELS, te);
  const f = parseNumberEntry(factor, FACTOR, te);
  const ready = e.value !== null && r.value !== null && k.value !== null && !f.error;
  const estimate = ready
    ? compute(() =>
        grainYieldEstimate({
          earsPerThousandthAcre: e.value!,
          kernelRows: r.value!,
          kernelsPerRow: k.value!,
          kernelFactor: f.value ?? undefined,
        }),
      )
    : null;

  return (
    <div className="space-y-4">
      <NumberField label={t("ears")} hint={t("earsHint")} value={ears} onChange={setEars} spec={EARS} />
      <div className="grid grid-cols-2 gap-3">
        <NumberField label={t("rows")} value={rows} onChange={setRows} spec={ROWS} />
        <NumberField label={t("kernels")} value={kernels} onChange={setKernels} spec={KERNELS} />
      </div>
      <NumberField
        label={t("factor")}
        hint={t("factorHint")}
        value={factor}
        onChange={setFactor}
        spec={FACTOR}
      />
      <ResultPanel
        title={t("title")}
        formula={t("formula")}
        source={t("source")}
        error={estimate?.error}
        waiting={!estimate}
      >
        {estimate?.result !== undefined && estimate?.result !== null ? (
          <BigNumber value={fmt(estimate.result, 0)} unit="bu/acre" />
        ) : null}
      </ResultPanel>
    </div>
  );
}
