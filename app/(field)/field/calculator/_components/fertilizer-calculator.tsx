"use client";

import {
  auditPlacement,
  type Finding,
  nutrientsPer100FtOfRow,
  nutrientsPerAcre,
  type Placement,
  type RateUnit,
  type SoilTexture,
  saltLoad,
  seedPlacedCheck,
  sortFindings,
} from "@/lib/agronomy";
import { useTranslations } from "next-intl";
import { useState } from "react";
import type { CatalogProduct } from "@/db/queries/products";
import { compute, fmt, NumberField, parseNumberEntry, ResultPanel, SelectField } from "./form-fields";

const RATE = { min: 0, max: 500, unit: "per acre" } as const;
const SPACING = { min: 7.5, max: 60, unit: "in", length: true } as const;
const BESIDE = { min: 0, max: 60, unit: "in", length: true, optional: true } as const;
const BELOW = { min: -12, max: 24, unit: "in", length: true, optional: true } as const;

const SEVERITY_STYLE: Record<Finding["severity"], string> = {
  info: "border-water-500 bg-water-50",
  caution: "border-caution-500 bg-caution-50",
  warning: "border-caution-700 bg-caution-50",
  critical: "border-burn-700 bg-burn-50",
};

export function FertilizerCalculator({ products }: { products: CatalogProduct[] }) {
  const t = useTranslations("field.calculator.fertilizer");
  const te = useTranslations("field.calculator.errors");
  const [productId, setProductId] = useState(products[0]?.id ?? "");
  const product = products.find((p) => p.id === productId) ?? null;
  const [rate, setRate] = useState("");
  const [unit, setUnit] = useState<RateUnit>(product?.form === "dry" ? "lb/ac" : "gal/ac");
  const [placement, setPlacement] = useState<Placement>("seed_placed");
  const [spacing, setSpacing] = useState("30");
  const [soil, setSoil] = useState<SoilTexture>("medium");
  const [intendedBeside, setIntendedBeside] = useState("");
  const [intendedBelow, setIntendedBelow] = useState("");
  const [measuredBeside, setMeasuredBeside] = useState("");
  const [measuredBelow, setMeasuredBelow] = useState("");

  if (!product) return <p className="notice-caution">{t("noProducts")}</p>;

  const r = parseNumberEntry(rate, { ...RATE, unit }, te);
  const s = parseNumberEntry(spacing, SPACING, te);
  const ib = parseNumberEntry(intendedBeside, BESIDE, te);
  const iw = parseNumberEntry(intendedBelow, BELOW, te);
  const mb = parseNumberEntry(measuredBeside, BESIDE, te);
  const mw = parseNumberEntry(measuredBelow, BELOW, te);
  const banded = placement === "band_2x2" || placement === "side_dress";
  const unitProblem = unit === "gal/ac" && product.lbPerGal === null ? t("noDensity") : null;
  const ready = r.value !== null && s.value !== null && !unitProblem;
  const pair = (a: typeof ib, b: typeof iw) =>
    a.value !== null && b.value !== null ? { besideIn: a.value, belowIn: b.value } : null;

  const perAcre = ready ? compute(() => nutrientsPerAcre(product, r.value!, unit)) : null;
  const per100 =
    ready && banded ? compute(() => nutrientsPer100FtOfRow(product, r.value!, unit, s.value!)) : null;
  const salt = ready ? compute(() => saltLoad(product, r.value!, unit, s.value!)) : null;
  const seedSafe =
    ready && placement === "seed_placed" && perAcre?.result
      ? compute(() =>
          seedPlacedCheck({
            n: perAcre.result!.n,
            k2o: perAcre.result!.k2o,
            rowSpacingIn: s.value!,
            soil,
            urea: product.containsUrea,
            thiosulfate: product.containsThiosulfate,
          }),
        )
      : null;
  const audit = ready
    ? compute(() =>
        sortFindings(
          auditPlacement({
            placement,
            product,
            rate: r.value!,
            rateUnit: unit,
            rowSpacingIn: s.value!,
            soil,
            intended: pair(ib, iw),
            measured: pair(mb, mw),
          }),
        ),
      )
    : null;

  return (
    <div className="space-y-4">
      <p className="notice-caution" role="note">
        {t("caution")}
      </p>
      <SelectField
        label={t("product")}
        value={productId}
        onChange={(id) => {
          setProductId(id);
          const next = products.find((p) => p.id === id);
          if (next) setUnit(next.form === "dry" ? "lb/ac" : "gal/ac");
        }}
        options={products.map((p) => ({ value: p.id, label: p.name }))}
      />
      <p className="text-sm text-soil-700">
        {product.lbPerGal !== null
          ? t("density", { value: product.lbPerGal, source: product.densitySource ?? t("noSource") })
          : t("dry")}
        {" · "}
        {product.saltIndex !== null
          ? t("saltIndex", { value: product.saltIndex, source: product.saltIndexSource ?? t("noSource") })
          : t("noSaltIndex")}
      </p>
      <div className="grid grid-cols-2 gap-3">
        <NumberField label={t("rate")} value={rate} onChange={setRate} spec={{ ...RATE, unit }} />
        <SelectField
          label={t("rateUnit")}
          value={unit}
          onChange={setUnit}
          options={[
            { value: "gal/ac", label: "gal/acre" },
            { value: "lb/ac", label: "lb/acre" },
          ]}
        />
      </div>
      {unitProblem ? <p className="field-error">{unitProblem}</p> : null}
      <SelectField
        label={t("placement")}
        value={placement}
        onChange={setPlacement}
        options={(["seed_placed", "band_2x2", "side_dress", "broadcast"] as const).map((p) => ({
          value: p,
          label: t(`placements.${p}`),
        }))}
      />
      <div className="grid grid-cols-2 gap-3">
        <NumberField label={t("rowSpacing")} value={spacing} onChange={setSpacing} spec={SPACING} />
        <SelectField
          label={t("soil")}
          value={soil}
          onChange={setSoil}
          options={(["coarse", "medium", "fine"] as const).map((v) => ({ value: v, label: t(`soils.${v}`) }))}
        />
      </div>
      {banded ? (
        <fieldset className="space-y-3 rounded-card border border-soil-200 p-3">
          <legend className="px-1 font-semibold">{t("offsets")}</legend>
          <div className="grid grid-cols-2 gap-3">
            <NumberField
              label={t("intendedBeside")}
              value={intendedBeside}
              onChange={setIntendedBeside}
              spec={BESIDE}
            />
            <NumberField
              label={t("intendedBelow")}
              value={intendedBelow}
              onChange={setIntendedBelow}
              spec={BELOW}
            />
            <NumberField
              label={t("measuredBeside")}
              value={measuredBeside}
              onChange={setMeasuredBeside}
              spec={BESIDE}
            />
            <NumberField
              label={t("measuredBelow")}
              value={measuredBelow}
              onChange={setMeasuredBelow}
              spec={BELOW}
            />
          </div>
        </fieldset>
      ) : null}

      <ResultPanel
        title={t("unitsTitle")}
        formula={unit === "gal/ac" ? t("unitsFormulaLiquid") : t("unitsFormulaDry")}
        source={t("unitsSource")}
        error={perAcre?.error}
        waiting={!perAcre}
      >
        {perAcre?.result ? (
          <table className="w-full text-left">
            <thead>
              <tr>
                <th scope="col">{t("nutrient")}</th>
                <th scope="col" className="text-right">
                  lb/acre
                </th>
                {per100?.result ? (
                  <th scope="col" className="text-right">
                    {t("per100ft")}
                  </th>
                ) : null}
              </tr>
            </thead>
            <tbody>
              {(["n", "p2o5", "k2o", "s"] as const).map((k) => (
                <tr key={k} className="border-t border-soil-200">
                  <th scope="row">{t(`nutrients.${k}`)}</th>
                  <td className="text-right font-bold">{fmt(perAcre.result![k], 1)}</td>
                  {per100?.result ? <td className="text-right">{fmt(per100.result[k], 3)}</td> : null}
                </tr>
              ))}
            </tbody>
          </table>
        ) : null}
        {salt?.result ? (
          <p className="mt-2">
            {t("saltLoad", { value: fmt(salt.result.sodiumNitrateEquivalentLbPerAcre, 1) })}
          </p>
        ) : null}
      </ResultPanel>

      {placement === "seed_placed" ? (
        <ResultPanel
          title={t("seedSafeTitle")}
          formula={t("seedSafeFormula")}
          source={t("seedSafeSource")}
          error={seedSafe?.error}
          waiting={!seedSafe}
        >
          {seedSafe?.result ? (
            <>
              <p
                className={`text-xl font-bold ${seedSafe.result.safe ? "text-sprout-900" : "text-burn-700"}`}
              >
                {seedSafe.result.safe ? t("safe") : t("unsafe")}
              </p>
              <p>{t("limit", { value: fmt(seedSafe.result.limitLbPerAcre, 1) })}</p>
              <ul className="mt-1 list-disc pl-5">
                {seedSafe.result.reasons.map((reason) => (
                  <li key={reason}>{reason}</li>
                ))}
              </ul>
            </>
          ) : null}
        </ResultPanel>
      ) : null}

      <ResultPanel
        title={t("auditTitle")}
        formula={t("auditFormula")}
        source={t("auditSource")}
        error={audit?.error}
        waiting={!audit}
      >
        {audit?.result ? (
          audit.result.length === 0 ? (
            <p>{t("noFindings")}</p>
          ) : (
            <ul className="space-y-2">
              {audit.result.map((f) => (
                <li
                  key={`${f.code}-${f.message}`}
                  className={`rounded-lg border-l-8 p-3 ${SEVERITY_STYLE[f.severity]}`}
                >
                  <p className="font-bold">{t(`severity.${f.severity}`)}</p>
                  <p>{f.message}</p>
                </li>
              ))}
            </ul>
          )
        ) : null}
      </ResultPanel>
    </div>
  );
}
