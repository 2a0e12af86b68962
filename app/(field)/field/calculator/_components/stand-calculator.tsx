"use client";

import { plantsPerAcre, rowLengthForThousandthAcre, splitFeetInches } from "@/lib/agronomy";
import { useTranslations } from "next-intl";
import { useState } from "react";
import { BigNumber, compute, fmt, NumberField, parseNumberEntry, ResultPanel } from "./form-fields";

const SPACING = { min: 7.5, max: 60, unit: "in", length: true } as const;
const COUNT = { min: 0, max: 500, unit: "plants", integer: true } as const;
const LENGTH = { min: 1, max: 200, unit: "ft", optional: true } as const;

export function StandCalculator() {
  const t = useTranslations("field.calculator.stand");
  const te = useTranslations("field.calculator.errors");
  const [spacing, setSpacing] = useState("30");
  const [count, setCount] = useState("");
  const [length, setLength] = useState("");

  const s = parseNumberEntry(spacing, SPACING, te);
  const c = parseNumberEntry(count, COUNT, te);
  const l = parseNumberEntry(length, LENGTH, te);

  const rowLength = s.value === null ? null : compute(() => rowLengthForThousandthAcre(s.value!));
  const usedLength = l.value ?? rowLength?.result ?? null;
  const stand =
    s.value !== null && c.value !== null && usedLength !== null && !l.error
      ? compute(() => plantsPerAcre(c.value!, usedLength, s.value!))
      : null;
  const feetInches = rowLength?.result ? splitFeetInches(rowLength.result) : null;

  return (
    <div className="space-y-4">
      <NumberField
        label={t("rowSpacing")}
        hint={t("rowSpacingHint")}
        value={spacing}
        onChange={setSpacing}
        spec={SPACING}
      />
      <ResultPanel
        title={t("rowLengthTitle")}
        formula={t("rowLengthFormula")}
        source={t("rowLengthSource")}
        error={rowLength?.error}
        waiting={!rowLength}
      >
        {rowLength?.result && feetInches ? (
          <BigNumber
            value={fmt(rowLength.result, 2)}
            unit={t("ftOfRow", { ft: feetInches.feet, in: feetInches.inches })}
          />
        ) : null}
      </ResultPanel>
      <NumberField label={t("count")} hint={t("countHint")} value={count} onChange={setCount} spec={COUNT} />
      <NumberField
        label={t("length")}
        hint={t("lengthHint")}
        value={length}
        onChange={setLength}
        spec={LENGTH}
      />
      <ResultPanel
        title={t("standTitle")}
        formula={t("standFormula")}
        source={t("standSource")}
        error={stand?.error}
        waiting={!stand}
      >
        {stand?.result !== undefined && stand?.result !== null ? (
          <BigNumber value={fmt(stand.result, 0)} unit={t("plantsPerAcre")} />
        ) : null}
      </ResultPanel>
    </div>
  );
}
