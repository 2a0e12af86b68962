"use client";

import { dailyGdd, predictLeafStage, gddForLeafStage } from "@/lib/agronomy";
import { useTranslations } from "next-intl";
import { useState } from "react";
import {
  BigNumber,
  compute,
  fmt,
  NumberField,
  parseNumberEntry,
  ResultPanel,
  SelectField,
} from "./form-fields";

const TEMP_F = { min: -40, max: 130, unit: "°F" } as const;
const TEMP_C = { min: -40, max: 55, unit: "°C" } as const;
const GDD = { min: 0, max: 5000, unit: "°F-GDD" } as const;

export function GddCalculator() {
  const t = useTranslations("field.calculator.gdd");
  const te = useTranslations("field.calculator.errors");
  const [unit, setUnit] = useState<"F" | "C">("F");
  const [max, setMax] = useState("");
  const [min, setMin] = useState("");
  const [since, setSince] = useState("");

  const spec = unit === "F" ? TEMP_F : TEMP_C;
  const hi = parseNumberEntry(max, spec, te);
  const lo = parseNumberEntry(min, spec, te);
  const day =
    hi.value !== null && lo.value !== null ? compute(() => dailyGdd(hi.value!, lo.value!, unit)) : null;

  const g = parseNumberEntry(since, GDD, te);
  const stage = g.value !== null ? compute(() => predictLeafStage(g.value!)) : null;
  const next =
    stage?.result && !stage.result.atOrPastVT
      ? compute(() => {
          const nextStage =
            stage.result!.stage === "planted"
              ? "VE"
              : stage.result!.stage === "VE"
                ? "V1"
                : `V${stage.result!.leafCollars + 1}`;
          return { stage: nextStage, gdd: gddForLeafStage(nextStage) - g.value! };
        })
      : null;

  return (
    <div className="space-y-4">
      <SelectField
        label={t("unit")}
        value={unit}
        onChange={setUnit}
        options={[
          { value: "F", label: t("unitF") },
          { value: "C", label: t("unitC") },
        ]}
      />
      <div className="grid grid-cols-2 gap-3">
        <NumberField label={t("max")} value={max} onChange={setMax} spec={spec} />
        <NumberField label={t("min")} value={min} onChange={setMin} spec={spec} />
      </div>
      <ResultPanel
        title={t("dailyTitle")}
        formula={unit === "F" ? t("dailyFormulaF") : t("dailyFormulaC")}
        source={t("dailySource")}
        error={day?.error}
        waiting={!day}
      >
        {day?.result !== undefined && day?.result !== null ? (
          <BigNumber value={fmt(day.result, 1)} unit={unit === "F" ? "°F-GDD" : "°C-GDD"} />
        ) : null}
      </ResultPanel>

      <NumberField label={t("since")} hint={t("sinceHint")} value={since} onChange={setSince} spec={GDD} />
      <ResultPanel
        title={t("stageTitle")}
        formula={t("stageFormula")}
        source={t("stageSource")}
        error={stage?.error}
        waiting={!stage}
      >
        {stage?.result ? (
          <>
            <BigNumber
              value={stage.result.stage === "planted" ? t("notEmerged") : stage.result.stage}
              unit=""
            />
            {next?.result ? (
              <p className="mt-1">
                {t("nextStage", { stage: next.result.stage, gdd: fmt(next.result.gdd, 0) })}
              </p>
            ) : null}
            {stage.result.leafCollars >= 1 && stage.result.leafCollars <= 6 ? (
              <p className="mt-1 font-semibold text-sprout-900">{t("inWindow")}</p>
            ) : null}
          </>
        ) : null}
      </ResultPanel>
    </div>
  );
}
