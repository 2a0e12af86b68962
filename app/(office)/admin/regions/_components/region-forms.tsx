"use client";

import { useTranslations } from "next-intl";
import { useActionState, useId } from "react";
import { ActionNotice, FieldError } from "../../_components/action-notice";
import { SubmitButton } from "../../_components/submit-button";
import { createRegionAction, renameRegionAction } from "../actions";

export function CreateRegionForm() {
  const t = useTranslations("admin.regions");
  const [state, action] = useActionState(createRegionAction, null);
  const id = useId();
  const errors = state?.fieldErrors?.name;
  return (
    <div className="card space-y-3">
      <h2 id={`${id}-heading`}>{t("create.heading")}</h2>
      <form action={action} aria-labelledby={`${id}-heading`} className="max-w-xl space-y-3" noValidate>
        <div>
          <label htmlFor={`${id}-name`} className="field-label">
            {t("create.name")}
          </label>
          <input
            id={`${id}-name`}
            name="name"
            required
            maxLength={80}
            autoComplete="off"
            className="field-input"
            defaultValue={state?.values?.name ?? ""}
            aria-invalid={errors ? true : undefined}
            aria-describedby={errors ? `${id}-name-error` : undefined}
          />
          <FieldError id={`${id}-name-error`} messages={errors} />
        </div>
        <SubmitButton label={t("create.submit")} pendingLabel={t("create.pending")} />
      </form>
      <ActionNotice
        error={state?.error}
        success={state?.data ? t("create.done", { name: state.data.name }) : null}
      />
    </div>
  );
}

export function RenameRegionForm({ region }: { region: { id: string; name: string } }) {
  const t = useTranslations("admin.regions");
  const tc = useTranslations("common");
  const [state, action] = useActionState(renameRegionAction, null);
  const id = useId();
  const errors = state?.fieldErrors?.name;
  return (
    <details>
      <summary className="btn-secondary cursor-pointer list-none">
        {t("rename.open")}
        <span className="sr-only">: {region.name}</span>
      </summary>
      <div className="mt-3 min-w-64 space-y-2">
        <form action={action} key={region.name} className="space-y-2" noValidate>
          <input type="hidden" name="regionId" value={region.id} />
          <label htmlFor={`${id}-name`} className="field-label">
            {t("rename.name")}
          </label>
          <input
            id={`${id}-name`}
            name="name"
            required
            maxLength={80}
            defaultValue={state?.values?.name ?? region.name}
            autoComplete="off"
            className="field-input"
            aria-invalid={errors ? true : undefined}
            aria-describedby={errors ? `${id}-name-error` : undefined}
          />
          <FieldError id={`${id}-name-error`} messages={errors} />
          <SubmitButton label={t("rename.submit")} pendingLabel={tc("saving")} />
        </form>
        <ActionNotice
          error={state?.error}
          success={state?.data ? t("rename.done", { name: state.data.name }) : null}
        />
      </div>
    </details>
  );
}
