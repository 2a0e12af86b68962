"use client";

import Link from "next/link";
import { useTranslations } from "next-intl";
import { useActionState, useId } from "react";
import type { ActionResult } from "@/lib/admin/schemas";
import { ActionNotice, FieldError } from "../../_components/action-notice";
import { SubmitButton } from "../../_components/submit-button";
import { createAccountAction, updateAccountAction } from "../actions";

interface RegionOption {
  id: string;
  name: string;
}

interface AccountValues {
  name: string;
  locality: string | null;
  regionId: string;
}

// Name, locality and region: the fields shared by "create account" and the account page's edit form.
function AccountFields({
  state,
  initial,
  regions,
}: {
  state: ActionResult<unknown> | null;
  initial: AccountValues | null;
  regions: RegionOption[];
}) {
  const t = useTranslations("admin.accounts.form");
  const id = useId();
  const errors = state?.fieldErrors ?? {};
  const value = (k: keyof AccountValues) => state?.values?.[k] ?? initial?.[k] ?? "";
  const describedBy = (k: string) => (errors[k] ? `${id}-${k}-error` : undefined);
  return (
    <div className="grid gap-4 sm:grid-cols-3">
      <div>
        <label htmlFor={`${id}-name`} className="field-label">
          {t("name")}
        </label>
        <input
          id={`${id}-name`}
          name="name"
          required
          maxLength={120}
          autoComplete="off"
          defaultValue={value("name")}
          className="field-input"
          aria-invalid={errors.name ? true : undefined}
          aria-describedby={describedBy("name")}
        />
        <FieldError id={`${id}-name-error`} messages={errors.name} />
      </div>
      <div>
        <label htmlFor={`${id}-locality`} className="field-label">
          {t("locality")} <span className="font-normal text-soil-700">{t("optional")}</span>
        </label>
        <input
          id={`${id}-locality`}
          name="locality"
          maxLength={120}
          autoComplete="off"
          defaultValue={value("locality")}
          className="field-input"
          aria-invalid={errors.locality ? true : undefined}
          aria-describedby={describedBy("locality")}
        />
        <FieldError id={`${id}-locality-error`} messages={errors.locality} />
      </div>
      <div>
        <label htmlFor={`${id}-region`} className="field-label">
          {t("region")}
        </label>
        <select
          id={`${id}-region`}
          name="regionId"
          required
          defaultValue={value("regionId")}
          className="field-input"
          aria-invalid={errors.regionId ? true : undefined}
          aria-describedby={describedBy("regionId")}
        >
          <option value="">{t("chooseRegion")}</option>
          {regions.map((r) => (
            <option key={r.id} value={r.id}>
              {r.name}
            </option>
          ))}
        </select>
        <FieldError id={`${id}-regionId-error`} messages={errors.regionId} />
      </div>
    </div>
  );
}

export function CreateAccountForm({ regions }: { regions: RegionOption[] }) {
  const t = useTranslations("admin.accounts");
  const [state, action] = useActionState(createAccountAction, null);
  const id = useId();
  return (
    <div className="card space-y-3">
      <h2 id={`${id}-heading`}>{t("create.heading")}</h2>
      <form action={action} aria-labelledby={`${id}-heading`} className="space-y-4" noValidate>
        <AccountFields state={state} initial={null} regions={regions} />
        <SubmitButton label={t("create.submit")} pendingLabel={t("create.pending")} />
      </form>
      <ActionNotice
        error={state?.error}
        success={state?.data ? t("create.done", { name: state.data.name }) : null}
      >
        {state?.data ? (
          <>
            {" "}
            <Link
              className="font-semibold text-water-700 underline"
              href={`/admin/accounts/${state.data.id}`}
            >
              {t("create.open", { name: state.data.name })}
            </Link>
          </>
        ) : null}
      </ActionNotice>
    </div>
  );
}

export function EditAccountForm({
  account,
  regions,
}: {
  account: AccountValues & { id: string };
  regions: RegionOption[];
}) {
  const t = useTranslations("admin.accounts");
  const tc = useTranslations("common");
  const [state, action] = useActionState(updateAccountAction, null);
  const id = useId();
  return (
    <div className="card space-y-3">
      <h2 id={`${id}-heading`}>{t("edit.heading")}</h2>
      <form
        action={action}
        key={`${account.name}|${account.locality}|${account.regionId}`}
        aria-labelledby={`${id}-heading`}
        className="space-y-4"
        noValidate
      >
        <input type="hidden" name="accountId" value={account.id} />
        <AccountFields state={state} initial={account} regions={regions} />
        <SubmitButton label={tc("save")} pendingLabel={tc("saving")} />
      </form>
      <ActionNotice
        error={state?.error}
        success={state?.data ? t("edit.done", { name: state.data.name }) : null}
      />
    </div>
  );
}
