"use client";

import { useTranslations } from "next-intl";
import { useFormContext } from "react-hook-form";
import type { DigFormOutput, DigFormValues } from "@/lib/digs/form-schema";
import { FINDINGS, INJURY, LEAF_STAGES, MESOCOTYL } from "@/sync/protocol";
import type { DigPhoto } from "./dig-photos";
import { RadioChoices, SelectInput, TextArea, TextInput } from "./form-controls";
import { PhotoStrip } from "./photo-strip";

const SCORES = ["5", "4", "3", "2", "1", "0"] as const;

// One dug plant: what the rep reads off the washed roots, in the order they look at them.
export function PlantCard({
  index,
  plantId,
  readOnly,
  canRemove,
  onRemove,
  photos,
  onAddPhoto,
  onCaption,
  onRemovePhoto,
}: {
  index: number;
  plantId: string;
  readOnly: boolean;
  canRemove: boolean;
  onRemove: () => void;
  photos: DigPhoto[];
  onAddPhoto: (photo: DigPhoto) => void;
  onCaption: (id: string, caption: string) => void;
  onRemovePhoto: (photo: DigPhoto) => void;
}) {
  const t = useTranslations("dig.plant");
  const {
    register,
    formState: { errors },
  } = useFormContext<DigFormValues, unknown, DigFormOutput>();
  const e = errors.plants?.[index];
  const name = <K extends keyof DigFormValues["plants"][number]>(key: K) => `plants.${index}.${key}` as const;
  const n = index + 1;
  const injuryOptions = INJURY.map((v) => ({ value: v, label: t(`injury.${v}`) }));

  return (
    <section aria-labelledby={`${plantId}-heading`} className="card mt-4 border-2 border-soil-300">
      <div className="flex items-center justify-between gap-3">
        <h3 id={`${plantId}-heading`} className="text-lg font-bold">
          {t("heading", { n })}
        </h3>
        {canRemove ? (
          <button
            type="button"
            className="btn-secondary"
            onClick={onRemove}
            aria-label={t("removeLabel", { n })}
          >
            {t("remove")}
          </button>
        ) : null}
      </div>
      <input type="hidden" {...register(name("id"))} />

      <div className="mt-3 grid gap-4 sm:grid-cols-2">
        <SelectInput
          label={t("leafStage")}
          hint={t("leafStageHint")}
          placeholder={t("choose")}
          options={LEAF_STAGES.map((s) => ({
            value: s,
            label: t(s === "VE" ? "stageVE" : "stageV", { stage: s, n: s.slice(1) }),
          }))}
          registration={register(name("leafStage"))}
          error={e?.leafStage}
        />
        <SelectInput
          label={t("mesocotyl")}
          hint={t("mesocotylHint")}
          placeholder={t("notChecked")}
          options={MESOCOTYL.map((v) => ({ value: v, label: t(`mesocotylValue.${v}`) }))}
          registration={register(name("mesocotyl"))}
          error={e?.mesocotyl}
        />
        <TextInput
          label={t("seedingDepth")}
          unit={t("inches")}
          hint={t("lengthHint")}
          registration={register(name("seedingDepth"))}
          error={e?.seedingDepth}
        />
        <TextInput
          label={t("crownDepth")}
          unit={t("inches")}
          hint={t("crownDepthHint")}
          registration={register(name("crownDepth"))}
          error={e?.crownDepth}
        />
      </div>

      <div className="mt-4">
        <RadioChoices
          legend={t("seminalScore")}
          hint={t("seminalScoreHint")}
          options={[
            ...SCORES.map((s) => ({ value: s, label: s, detail: t(`score.${s}`) })),
            { value: "", label: t("notScored") },
          ]}
          columns={1}
          registration={register(name("seminalScore"))}
          error={e?.seminalScore}
        />
      </div>

      <div className="mt-4 grid gap-4 sm:grid-cols-3">
        <TextInput
          label={t("nodalWhorls")}
          inputMode="numeric"
          registration={register(name("nodalWhorls"))}
          error={e?.nodalWhorls}
        />
        <TextInput
          label={t("nodalCount")}
          inputMode="numeric"
          registration={register(name("nodalCount"))}
          error={e?.nodalCount}
        />
        <TextInput
          label={t("longestNodal")}
          unit={t("inches")}
          registration={register(name("longestNodal"))}
          error={e?.longestNodal}
        />
      </div>

      <div className="mt-4 grid gap-4 sm:grid-cols-2">
        <RadioChoices
          legend={t("seminalInjury")}
          options={injuryOptions}
          registration={register(name("seminalInjury"))}
          error={e?.seminalInjury}
        />
        <RadioChoices
          legend={t("nodalInjury")}
          options={injuryOptions}
          registration={register(name("nodalInjury"))}
          error={e?.nodalInjury}
        />
      </div>

      <fieldset className="mt-4">
        <legend className="field-label">{t("findings")}</legend>
        <div className="flex flex-wrap gap-2">
          {FINDINGS.map((f) => (
            <label
              key={f}
              className="flex min-h-tap cursor-pointer items-center gap-2 rounded-full border-2 border-soil-500 bg-white px-4 has-checked:border-sprout-900 has-checked:bg-sprout-50 has-focus-visible:outline-3 has-focus-visible:outline-water-500"
            >
              <input
                type="checkbox"
                value={f}
                className="size-5 accent-sprout-700"
                {...register(name("findings"))}
              />
              <span className="font-semibold">{t(`finding.${f}`)}</span>
            </label>
          ))}
        </div>
        {e?.findings?.message ? <p className="field-error">{e.findings.message}</p> : null}
      </fieldset>

      <fieldset className="mt-4">
        <legend className="field-label">{t("band")}</legend>
        <p className="mb-2 text-sm text-soil-700">{t("bandHint")}</p>
        <div className="grid gap-4 sm:grid-cols-2">
          <TextInput
            label={t("bandBeside")}
            unit={t("inches")}
            registration={register(name("bandBeside"))}
            error={e?.bandBeside}
          />
          <TextInput
            label={t("bandBelow")}
            unit={t("inches")}
            hint={t("bandBelowHint")}
            registration={register(name("bandBelow"))}
            error={e?.bandBelow}
          />
        </div>
      </fieldset>

      <div className="mt-4">
        <TextArea
          label={t("notes")}
          rows={2}
          maxLength={2000}
          registration={register(name("notes"))}
          error={e?.notes}
        />
      </div>

      <PhotoStrip
        owner={t("owner", { n })}
        dugPlantId={plantId}
        photos={photos}
        readOnly={readOnly}
        onAdd={onAddPhoto}
        onCaption={onCaption}
        onRemove={onRemovePhoto}
      />
    </section>
  );
}
