"use client";

import { useTranslations } from "next-intl";
import { useActionState, useId, useState } from "react";
import { ActionNotice } from "@/app/(office)/admin/_components/action-notice";
import { SubmitButton } from "@/app/(office)/admin/_components/submit-button";
import { PLACEMENTS, RATE_UNITS } from "@/lib/records/schemas";
import { savePassAction } from "../actions";
import { InputField, SelectField, TextAreaField } from "./form-controls";

export interface PassValues {
  id: string;
  plantingId: string | null;
  productId: string;
  appliedOn: string;
  rate: number;
  rateUnit: (typeof RATE_UNITS)[number];
  placement: (typeof PLACEMENTS)[number];
  intendedBesideIn: number | null;
  intendedBelowIn: number | null;
  notes: string | null;
}

export interface ProductOption {
  id: string;
  /** Chemistry and grade, as the catalog names it. */
  name: string;
}

export interface PlantingOption {
  id: string;
  label: string;
}

/** Creates a fertilizer pass on the field, or edits `pass` when given (its planting stays). */
export function PassForm({
  fieldId,
  pass,
  products,
  plantings,
}: {
  fieldId: string;
  pass?: PassValues;
  products: ProductOption[];
  plantings: PlantingOption[];
}) {
  const t = useTranslations("fieldPage");
  const [state, action] = useActionState(savePassAction, null);
  const id = useId();
  const errors = state?.fieldErrors ?? {};
  const value = (k: keyof PassValues, fallback = "") =>
    state?.values?.[k] ?? (pass ? String(pass[k] ?? "") : fallback);
  const [placement, setPlacement] = useState(value("placement", "seed_placed"));
  const banded = placement === "band_2x2" || placement === "side_dress";
  if (products.length === 0) return <p className="notice-caution">{t("passes.noProducts")}</p>;
  const productOptions = products.map((p) => ({ value: p.id, label: p.name }));
  const known = products.some((p) => p.id === value("productId"));
  return (
    <form action={action} className="space-y-4" noValidate>
      <input type="hidden" name="fieldId" value={fieldId} />
      {pass ? <input type="hidden" name="passId" value={pass.id} /> : null}
      {pass ? <input type="hidden" name="plantingId" value={pass.plantingId ?? ""} /> : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField
          id={`${id}-productId`}
          name="productId"
          label={t("passes.product")}
          defaultValue={known ? value("productId") : ""}
          options={[{ value: "", label: t("passes.choose") }, ...productOptions]}
          required
          errors={errors.productId}
        />
        {pass ? null : (
          <SelectField
            id={`${id}-plantingId`}
            name="plantingId"
            label={t("passes.planting")}
            defaultValue={value("plantingId", plantings[0]?.id ?? "")}
            options={[
              ...plantings.map((p) => ({ value: p.id, label: p.label })),
              { value: "", label: t("passes.wholeField") },
            ]}
            errors={errors.plantingId}
          />
        )}
        <InputField
          id={`${id}-appliedOn`}
          name="appliedOn"
          type="date"
          label={t("passes.appliedOn")}
          defaultValue={value("appliedOn")}
          required
          errors={errors.appliedOn}
        />
        <div className="grid grid-cols-2 gap-3">
          <InputField
            id={`${id}-rate`}
            name="rate"
            inputMode="decimal"
            label={t("passes.rate")}
            defaultValue={value("rate")}
            required
            errors={errors.rate}
          />
          <SelectField
            id={`${id}-rateUnit`}
            name="rateUnit"
            label={t("passes.rateUnit")}
            defaultValue={value("rateUnit", "gal/ac")}
            options={RATE_UNITS.map((u) => ({ value: u, label: t(`passes.rateUnits.${u}`) }))}
            errors={errors.rateUnit}
          />
        </div>
        <SelectField
          id={`${id}-placement`}
          name="placement"
          label={t("passes.placement")}
          value={placement}
          onChange={(e) => setPlacement(e.target.value)}
          options={PLACEMENTS.map((p) => ({ value: p, label: t(`placements.${p}`) }))}
          errors={errors.placement}
        />
        {banded ? (
          <fieldset className="grid grid-cols-2 gap-3 sm:col-span-2">
            <legend className="mb-1 text-sm text-soil-700">{t("passes.offsetsHint")}</legend>
            <InputField
              id={`${id}-intendedBesideIn`}
              name="intendedBesideIn"
              inputMode="decimal"
              label={t("passes.intendedBeside")}
              optional
              defaultValue={value("intendedBesideIn")}
              errors={errors.intendedBesideIn}
            />
            <InputField
              id={`${id}-intendedBelowIn`}
              name="intendedBelowIn"
              inputMode="decimal"
              label={t("passes.intendedBelow")}
              optional
              defaultValue={value("intendedBelowIn")}
              errors={errors.intendedBelowIn}
            />
          </fieldset>
        ) : null}
        <TextAreaField
          id={`${id}-notes`}
          name="notes"
          label={t("passes.notes")}
          optional
          maxLength={4000}
          defaultValue={value("notes")}
          errors={errors.notes}
        />
      </div>
      <ActionNotice error={state?.error} success={state?.data ? t("passes.saved") : null} />
      <SubmitButton label={t("passes.save")} pendingLabel={t("passes.saving")} />
    </form>
  );
}
