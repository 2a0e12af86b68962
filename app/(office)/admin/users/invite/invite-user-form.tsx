"use client";

import { useTranslations } from "next-intl";
import { useId, useRef, useState, useTransition } from "react";
import type { Role } from "@/db/schema";
import { type InviteField, type InviteUserResult, inviteUserAction } from "./actions";

interface Props {
  roles: { value: Role; label: string }[];
  regions: { id: string; name: string }[];
  accounts: { id: string; name: string; locality: string | null; regionId: string }[];
}

const WITH_ACCOUNTS: Role[] = ["rep", "grower"];

export function InviteUserForm({ roles, regions, accounts }: Props) {
  const t = useTranslations("auth.inviteUser");
  const id = useId();
  const formRef = useRef<HTMLFormElement>(null);
  const [pending, startTransition] = useTransition();
  const [result, setResult] = useState<InviteUserResult | null>(null);
  const [role, setRole] = useState<Role | "">("");
  const [regionId, setRegionId] = useState("");
  const [chosen, setChosen] = useState<Set<string>>(new Set());

  const fieldErrors: Partial<Record<InviteField, string>> =
    result && "error" in result ? (result.fieldErrors ?? {}) : {};
  const regionAccounts = accounts.filter((a) => a.regionId === regionId);
  const showAccounts = role !== "" && WITH_ACCOUNTS.includes(role);

  function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const data = new FormData(e.currentTarget);
    startTransition(async () => {
      try {
        const r = await inviteUserAction(data);
        setResult(r);
        if ("data" in r) {
          formRef.current?.reset();
          setRole("");
          setRegionId("");
          setChosen(new Set());
        }
      } catch {
        setResult({ error: t("errors.failed") });
      }
    });
  }

  const err = (field: InviteField) => fieldErrors[field];
  const describedBy = (field: InviteField, hint?: string) =>
    [err(field) ? `${id}-${field}-error` : null, hint ?? null].filter(Boolean).join(" ") || undefined;
  const errorText = (field: InviteField) =>
    err(field) ? (
      <p id={`${id}-${field}-error`} className="field-error">
        {err(field)}
      </p>
    ) : null;

  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate className="space-y-5">
      {result && "data" in result ? (
        <p className="notice-ok" role="status">
          {result.data.reinvited
            ? t("resent", { email: result.data.email })
            : t("sent", { email: result.data.email })}
        </p>
      ) : null}
      {result && "error" in result ? (
        <p className="notice-error" role="alert">
          {result.error}
        </p>
      ) : null}

      <div>
        <label htmlFor={`${id}-email`} className="field-label">
          {t("email")}
        </label>
        <input
          id={`${id}-email`}
          name="email"
          type="email"
          inputMode="email"
          autoComplete="off"
          required
          className="field-input"
          aria-invalid={err("email") ? true : undefined}
          aria-describedby={describedBy("email")}
        />
        {errorText("email")}
      </div>

      <div>
        <label htmlFor={`${id}-name`} className="field-label">
          {t("name")}
        </label>
        <input
          id={`${id}-name`}
          name="name"
          type="text"
          autoComplete="off"
          required
          maxLength={120}
          className="field-input"
          aria-invalid={err("name") ? true : undefined}
          aria-describedby={describedBy("name")}
        />
        {errorText("name")}
      </div>

      <div>
        <label htmlFor={`${id}-role`} className="field-label">
          {t("role")}
        </label>
        <select
          id={`${id}-role`}
          name="role"
          required
          value={role}
          onChange={(e) => {
            setRole(e.target.value as Role | "");
            setChosen(new Set());
          }}
          className="field-input"
          aria-invalid={err("role") ? true : undefined}
          aria-describedby={describedBy("role")}
        >
          <option value="">{t("rolePlaceholder")}</option>
          {roles.map((r) => (
            <option key={r.value} value={r.value}>
              {r.label}
            </option>
          ))}
        </select>
        {errorText("role")}
      </div>

      <div>
        <label htmlFor={`${id}-region`} className="field-label">
          {t("region")}
        </label>
        <select
          id={`${id}-region`}
          name="regionId"
          required={role !== "admin"}
          value={regionId}
          onChange={(e) => {
            setRegionId(e.target.value);
            setChosen(new Set());
          }}
          className="field-input"
          aria-invalid={err("regionId") ? true : undefined}
          aria-describedby={describedBy("regionId", `${id}-region-hint`)}
        >
          <option value="">{role === "admin" ? t("regionNone") : t("regionPlaceholder")}</option>
          {regions.map((r) => (
            <option key={r.id} value={r.id}>
              {r.name}
            </option>
          ))}
        </select>
        <p id={`${id}-region-hint`} className="mt-1 text-sm text-soil-700">
          {t("regionHint")}
        </p>
        {errorText("regionId")}
      </div>

      {showAccounts ? (
        <fieldset aria-describedby={describedBy("accountIds", `${id}-accounts-hint`)}>
          <legend className="field-label">{t("accounts")}</legend>
          <p id={`${id}-accounts-hint`} className="mb-2 text-sm text-soil-700">
            {role === "rep" ? t("accountsHintRep") : t("accountsHintGrower")}
          </p>
          {regionId === "" ? (
            <p className="text-soil-700">{t("accountsChooseRegion")}</p>
          ) : regionAccounts.length === 0 ? (
            <p className="text-soil-700">{t("accountsEmpty")}</p>
          ) : (
            <ul className="divide-y divide-soil-200 rounded-lg border-2 border-soil-200">
              {regionAccounts.map((a) => (
                <li key={a.id}>
                  <label className="flex min-h-tap cursor-pointer items-center gap-3 px-3 py-2">
                    <input
                      type="checkbox"
                      name="accountIds"
                      value={a.id}
                      checked={chosen.has(a.id)}
                      onChange={(e) => {
                        const next = new Set(chosen);
                        if (e.target.checked) next.add(a.id);
                        else next.delete(a.id);
                        setChosen(next);
                      }}
                      className="size-6 accent-sprout-700"
                    />
                    <span>
                      <span className="font-semibold">{a.name}</span>
                      {a.locality ? <span className="block text-sm text-soil-700">{a.locality}</span> : null}
                    </span>
                  </label>
                </li>
              ))}
            </ul>
          )}
          {errorText("accountIds")}
        </fieldset>
      ) : null}

      <button type="submit" className="btn-primary w-full sm:w-auto" disabled={pending} aria-busy={pending}>
        {pending ? t("submitting") : t("submit")}
      </button>
    </form>
  );
}
