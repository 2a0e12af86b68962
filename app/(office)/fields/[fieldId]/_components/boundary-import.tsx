"use client";

import { useTranslations } from "next-intl";
import { useActionState, useId } from "react";
import { SubmitButton } from "@/app/(office)/admin/_components/submit-button";
import { type BoundaryResult, importBoundaryAction } from "../actions";

const fmt = (x: number, digits: number) => x.toLocaleString("en-US", { maximumFractionDigits: digits });

/** The outcome of a boundary save: a polite status when saved, an alert with every reason when not. */
export function BoundaryOutcome({ state }: { state: BoundaryResult | null }) {
  const t = useTranslations("fieldPage.boundary");
  return (
    <>
      <div role="status" className={state?.data ? "notice-ok" : "sr-only"}>
        {state?.data
          ? t("saved", { acres: fmt(state.data.areaAcres, 2), hectares: fmt(state.data.areaHectares, 2) })
          : ""}
      </div>
      {state?.error ? (
        <div role="alert" className="notice-error">
          <p>{state.error}</p>
          {state.problems?.length ? (
            <ul className="mt-1 list-disc pl-5">
              {state.problems.map((p) => (
                <li key={p}>{p}</li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
    </>
  );
}

export function BoundaryImportForm({ fieldId }: { fieldId: string }) {
  const t = useTranslations("fieldPage.boundary");
  const [state, action] = useActionState(importBoundaryAction, null);
  const id = useId();
  const failed = Boolean(state?.error);
  return (
    <form action={action} className="space-y-4">
      <input type="hidden" name="fieldId" value={fieldId} />
      <div className="grid gap-4 sm:grid-cols-[2fr_1fr]">
        <div>
          <label htmlFor={`${id}-file`} className="field-label">
            {t("file")}
          </label>
          <input
            id={`${id}-file`}
            name="file"
            type="file"
            accept=".geojson,.json,.kml,application/geo+json,application/json,application/vnd.google-earth.kml+xml"
            required
            className="field-input py-2"
            aria-invalid={failed ? true : undefined}
            aria-describedby={`${id}-hint`}
          />
          <p id={`${id}-hint`} className="mt-1 text-sm text-soil-700">
            {t("fileHint")}
          </p>
        </div>
        <div>
          <label htmlFor={`${id}-format`} className="field-label">
            {t("format")}
          </label>
          <select id={`${id}-format`} name="format" className="field-input" defaultValue="auto">
            {(["auto", "geojson", "kml"] as const).map((f) => (
              <option key={f} value={f}>
                {t(`formats.${f}`)}
              </option>
            ))}
          </select>
        </div>
      </div>
      <BoundaryOutcome state={state} />
      <SubmitButton label={t("import")} pendingLabel={t("importing")} />
    </form>
  );
}
