"use client";

import { useTranslations } from "next-intl";
import { useActionState, useId } from "react";
import { ActionNotice } from "@/app/(office)/admin/_components/action-notice";
import { SubmitButton } from "@/app/(office)/admin/_components/submit-button";
import { SOIL_TEXTURES } from "@/lib/records/schemas";
import { savePlantingAction } from "../actions";
import { InputField, SelectField, TextAreaField } from "./form-controls";

export interface PlantingValues {
  id: string;
  hybrid: string;
  plantedOn: string;
  seedingRate: number;
  seedingDepthIn: number;
  rowSpacingIn: number;
  soilTexture: (typeof SOIL_TEXTURES)[number];
  notes: string | null;
}

/** Creates a planting on the field, or edits `planting` when given. */
export function PlantingForm({
  fieldId,
  planting,
  defaultSoil,
}: {
  fieldId: string;
  planting?: PlantingValues;
  defaultSoil: (typeof SOIL_TEXTURES)[number];
}) {
  const t = useTranslations("fieldPage");
  const [state, action] = useActionState(savePlantingAction, null);
  const id = useId();
  const errors = state?.fieldErrors ?? {};
  const value = (k: keyof PlantingValues, fallback = "") =>
    state?.values?.[k] ?? (planting ? String(planting[k] ?? "") : fallback);
  return (
    <form action={action} className="space-y-4" noValidate>
      <input type="hidden" name="fieldId" value={fieldId} />
      {planting ? <input type="hidden" name="plantingId" value={planting.id} /> : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <InputField
          id={`${id}-hybrid`}
          name="hybrid"
          label={t("plantings.hybrid")}
          defaultValue={value("hybrid")}
          maxLength={80}
          autoComplete="off"
          required
          errors={errors.hybrid}
        />
        <InputField
          id={`${id}-plantedOn`}
          name="plantedOn"
          type="date"
          label={t("plantings.plantedOn")}
          defaultValue={value("plantedOn")}
          required
          errors={errors.plantedOn}
        />
        <InputField
          id={`${id}-seedingRate`}
          name="seedingRate"
          inputMode="numeric"
          label={`${t("plantings.seedingRate")} (${t("plantings.seedingRateUnit")})`}
          defaultValue={value("seedingRate")}
          required
          errors={errors.seedingRate}
        />
        <InputField
          id={`${id}-seedingDepthIn`}
          name="seedingDepthIn"
          inputMode="decimal"
          label={`${t("plantings.seedingDepth")} (in)`}
          defaultValue={value("seedingDepthIn")}
          required
          errors={errors.seedingDepthIn}
        />
        <InputField
          id={`${id}-rowSpacingIn`}
          name="rowSpacingIn"
          inputMode="decimal"
          label={`${t("plantings.rowSpacing")} (in)`}
          defaultValue={value("rowSpacingIn", "30")}
          required
          errors={errors.rowSpacingIn}
        />
        <SelectField
          id={`${id}-soilTexture`}
          name="soilTexture"
          label={t("plantings.soil")}
          defaultValue={value("soilTexture", defaultSoil)}
          options={SOIL_TEXTURES.map((s) => ({ value: s, label: t(`soils.${s}`) }))}
          errors={errors.soilTexture}
        />
        <TextAreaField
          id={`${id}-notes`}
          name="notes"
          label={t("plantings.notes")}
          optional
          maxLength={4000}
          defaultValue={value("notes")}
          errors={errors.notes}
        />
      </div>
      <ActionNotice
        error={state?.error}
        success={state?.data ? t("plantings.saved", { hybrid: state.data.hybrid }) : null}
      />
      <SubmitButton label={t("plantings.save")} pendingLabel={t("plantings.saving")} />
    </form>
  );
}
