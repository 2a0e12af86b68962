"use client";

import { useTranslations } from "next-intl";
import { useActionState } from "react";
import { ActionNotice, FieldError } from "../_components/action-notice";
import { SubmitButton } from "../_components/submit-button";
import { createProductAction } from "./actions";

type Field = { name: string; type?: "text" | "number"; step?: string; hint?: boolean };

const TEXT_FIELDS: Field[] = [{ name: "name", hint: true }, { name: "chemistry" }];
const GRADE_FIELDS: Field[] = ["gradeN", "gradeP2o5", "gradeK2o", "gradeS"].map((name) => ({
  name,
  type: "number",
  step: "0.1",
}));
const PROPERTY_FIELDS: Field[] = [
  { name: "lbPerGal", type: "number", step: "0.01" },
  { name: "densitySource" },
  { name: "saltIndex", type: "number", step: "0.1" },
  { name: "saltIndexSource" },
];

export function ProductForm() {
  const t = useTranslations("products.form");
  const [state, action] = useActionState(createProductAction, null);
  const values = state?.values ?? {};
  const errors = state?.fieldErrors ?? {};

  const input = (f: Field) => (
    <div key={f.name}>
      <label htmlFor={`product-${f.name}`} className="field-label">
        {t(`labels.${f.name}`)}
      </label>
      <input
        id={`product-${f.name}`}
        name={f.name}
        type={f.type ?? "text"}
        step={f.step}
        inputMode={f.type === "number" ? "decimal" : undefined}
        defaultValue={values[f.name] ?? ""}
        aria-invalid={errors[f.name] ? true : undefined}
        aria-describedby={
          [f.hint ? `product-${f.name}-hint` : "", errors[f.name] ? `product-${f.name}-error` : ""]
            .join(" ")
            .trim() || undefined
        }
        className="field-input"
      />
      {f.hint ? (
        <p id={`product-${f.name}-hint`} className="mt-1 text-sm text-soil-700">
          {t(`hints.${f.name}`)}
        </p>
      ) : null}
      <FieldError id={`product-${f.name}-error`} messages={errors[f.name]} />
    </div>
  );

  return (
    <form action={action} className="card space-y-4" noValidate key={state?.data?.name ?? "new"}>
      <h2>{t("title")}</h2>
      <ActionNotice
        error={state?.error}
        success={state?.data ? t("saved", { name: state.data.name }) : null}
      />
      <div className="grid gap-4 sm:grid-cols-2">{TEXT_FIELDS.map(input)}</div>
      <div>
        <label htmlFor="product-form" className="field-label">
          {t("labels.form")}
        </label>
        <select
          id="product-form"
          name="form"
          defaultValue={values.form ?? "liquid"}
          className="field-input"
          aria-invalid={errors.form ? true : undefined}
        >
          {(["liquid", "dry", "gas"] as const).map((f) => (
            <option key={f} value={f}>
              {t(`forms.${f}`)}
            </option>
          ))}
        </select>
        <FieldError id="product-form-error" messages={errors.form} />
      </div>
      <fieldset>
        <legend className="field-label">{t("grade")}</legend>
        <div className="grid grid-cols-2 gap-4 sm:grid-cols-4">{GRADE_FIELDS.map(input)}</div>
      </fieldset>
      <div className="grid gap-4 sm:grid-cols-2">{PROPERTY_FIELDS.map(input)}</div>
      <div className="flex flex-wrap gap-6">
        {(["containsUrea", "containsThiosulfate"] as const).map((name) => (
          <label key={name} className="flex min-h-tap items-center gap-3 font-semibold">
            <input type="checkbox" name={name} defaultChecked={values[name] === "on"} className="size-6" />
            {t(`labels.${name}`)}
          </label>
        ))}
      </div>
      <SubmitButton label={t("submit")} pendingLabel={t("submitting")} />
    </form>
  );
}
