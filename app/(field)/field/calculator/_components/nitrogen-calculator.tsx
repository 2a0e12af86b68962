"use client";

import { nitrogenBudget } from "@/lib/agronomy";
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

const GRAIN = { min: 0, max: 600, unit: "bu/acre" } as const;
const SILAGE = { min: 0, max: 80, unit: "tons/acre" } as const;
const PPM = { min: 0, max: 200, unit: "ppm NO3-N", optional: true } as const;
const DEPTH = { min: 0.25, max: 6, unit: "ft", optional: true } as const;
const FACTOR = { min: 2, max: 6, unit: "lb N per ppm per ft", optional: true } as const;
const ACRE_IN = { min: 0, max: 80, unit: "acre-in", optional: true } as const;
const LB_N = { min: 0, max: 400, unit: "lb N/acre", optional: true } as const;

export function NitrogenCalculator() {
  const t = useTranslations("field.calculator.nitrogen");
  const te = useTranslations("field.calculator.errors");
  const [crop, setCrop] = useState<"grain" | "silage">("grain");
  const [goal, setGoal] = useState("");
  const [soilPpm, setSoilPpm] = useState("");
  const [soilDepth, setSoilDepth] = useState("1");
  const [soilFactor, setSoilFactor] = useState("4");
  const [waterPpm, setWaterPpm] = useState("");
  const [waterIn, setWaterIn] = useState("");
  const [previous, setPrevious] = useState("");
  const [applied, setApplied] = useState("");

  const g = parseNumberEntry(goal, crop === "grain" ? GRAIN : SILAGE, te);
  const sp = parseNumberEntry(soilPpm, PPM, te);
  const sd = parseNumberEntry(soilDepth, DEPTH, te);
  const sf = parseNumberEntry(soilFactor, FACTOR, te);
  const wp = parseNumberEntry(waterPpm, PPM, te);
  const wi = parseNumberEntry(waterIn, ACRE_IN, te);
  const pc = parseNumberEntry(previous, LB_N, te);
  const ap = parseNumberEntry(applied, LB_N, te);
  const anyError = [sp, sd, sf, wp, wi, pc, ap].some((p) => p.error);

  const budget =
    g.value !== null && !anyError
      ? compute(() =>
          nitrogenBudget({
            yieldGoal:
              crop === "grain" ? { crop, bushelsPerAcre: g.value! } : { crop, tonsPerAcre: g.value! },
            soilNitrate: sp.value !== null ? [{ no3nPpm: sp.value, depthFt: sd.value ?? 1 }] : [],
            soilLbNPerPpmPerFt: sf.value ?? undefined,
            irrigationWater:
              wp.value !== null && wi.value !== null ? { no3nPpm: wp.value, acreInches: wi.value } : null,
            previousCropCreditLbN: pc.value ?? undefined,
            appliedPasses: ap.value !== null ? [{ label: t("appliedLabel"), lbNPerAcre: ap.value }] : [],
          }),
        )
      : null;

  return (
    <div className="space-y-4">
      <SelectField
        label={t("crop")}
        value={crop}
        onChange={setCrop}
        options={[
          { value: "grain", label: t("grain") },
          { value: "silage", label: t("silage") },
        ]}
      />
      <NumberField
        label={crop === "grain" ? t("goalGrain") : t("goalSilage")}
        value={goal}
        onChange={setGoal}
        spec={crop === "grain" ? GRAIN : SILAGE}
      />
      <fieldset className="space-y-3 rounded-card border border-soil-200 p-3">
        <legend className="px-1 font-semibold">{t("soil")}</legend>
        <div className="grid grid-cols-2 gap-3">
          <NumberField label={t("soilPpm")} value={soilPpm} onChange={setSoilPpm} spec={PPM} />
          <NumberField label={t("soilDepth")} value={soilDepth} onChange={setSoilDepth} spec={DEPTH} />
        </div>
        <NumberField
          label={t("soilFactor")}
          hint={t("soilFactorHint")}
          value={soilFactor}
          onChange={setSoilFactor}
          spec={FACTOR}
        />
      </fieldset>
      <fieldset className="space-y-3 rounded-card border border-soil-200 p-3">
        <legend className="px-1 font-semibold">{t("water")}</legend>
        <div className="grid grid-cols-2 gap-3">
          <NumberField label={t("waterPpm")} value={waterPpm} onChange={setWaterPpm} spec={PPM} />
          <NumberField label={t("waterIn")} value={waterIn} onChange={setWaterIn} spec={ACRE_IN} />
        </div>
      </fieldset>
      <div className="grid grid-cols-2 gap-3">
        <NumberField label={t("previous")} value={previous} onChange={setPrevious} spec={LB_N} />
        <NumberField label={t("applied")} value={applied} onChange={setApplied} spec={LB_N} />
      </div>
      <ResultPanel
        title={t("title")}
        formula={t("formula")}
        source={t("source")}
        error={budget?.error}
        waiting={!budget}
      >
        {budget?.result ? (
          <>
            <BigNumber
              label={t("sideDress")}
              value={fmt(budget.result.sideDressNeededLbNPerAcre, 0)}
              unit="lb N/acre"
            />
            {budget.result.surplusLbNPerAcre > 0 ? (
              <p className="font-semibold">
                {t("surplus", { value: fmt(budget.result.surplusLbNPerAcre, 0) })}
              </p>
            ) : null}
            <table className="mt-2 w-full text-left text-sm">
              <tbody>
                {budget.result.lines.map((line) => (
                  <tr key={line.key} className="border-t border-soil-200">
                    <th scope="row" className="py-1 font-normal">
                      {line.label}
                      <span className="block text-xs text-soil-700">{line.source}</span>
                    </th>
                    <td className="py-1 text-right font-bold">
                      {line.kind === "need" ? "" : "−"}
                      {fmt(line.lbNPerAcre, 0)}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
            <p className="mt-2 text-sm">{budget.result.note}</p>
          </>
        ) : null}
      </ResultPanel>
    </div>
  );
}
