"use client";

import Link from "next/link";
import { useTranslations } from "next-intl";
import { useActionState, useEffect, useId, useRef, useState } from "react";
import type { Role, UserStatus } from "@/db/schema";
import type { ActionResult } from "@/lib/admin/schemas";
import { ActionNotice, FieldError } from "../../_components/action-notice";
import { SubmitButton } from "../../_components/submit-button";
import { changeUserRegion, changeUserRole, changeUserStatus, type UserChange } from "../actions";

export interface ManagedUser {
  id: string;
  name: string;
  role: Role;
  regionId: string | null;
  status: UserStatus;
}

// The per-user controls in the users table: role, region, and deactivate / reactivate with a
// confirmation step. Each form reports its own outcome.
export function UserManage({
  user,
  roles,
  regions,
  isSelf,
}: {
  user: ManagedUser;
  roles: readonly Role[];
  regions: { id: string; name: string }[];
  isSelf: boolean;
}) {
  const t = useTranslations("admin.users.manage");
  return (
    <details className="group">
      <summary className="btn-secondary min-w-32 cursor-pointer list-none">
        {t("open")}
        <span className="sr-only">: {user.name}</span>
      </summary>
      <div className="mt-3 grid min-w-64 gap-4">
        {isSelf ? <p className="notice-caution text-sm">{t("selfNote")}</p> : null}
        <RoleForm user={user} roles={roles} />
        <RegionForm user={user} regions={regions} />
        <StatusForm user={user} />
      </div>
    </details>
  );
}

function StillAssigned({ result }: { result: ActionResult<UserChange> | null }) {
  const t = useTranslations("admin.users.manage");
  const tr = useTranslations("common.roles");
  if (!result?.data) return null;
  const groups = (["rep", "grower"] as const).filter((k) => result.data.stillAssigned[k].length > 0);
  if (groups.length === 0) return null;
  return (
    <div className="mt-2 text-sm">
      {groups.map((kind) => (
        <div key={kind}>
          <p>{t("stillAssigned", { role: tr(kind) })}</p>
          <ul className="list-disc pl-6">
            {result.data.stillAssigned[kind].map((a) => (
              <li key={a.id}>
                <Link className="font-semibold text-water-700 underline" href={`/admin/accounts/${a.id}`}>
                  {a.name}
                </Link>
              </li>
            ))}
          </ul>
        </div>
      ))}
      <p>{t("stillAssignedHint")}</p>
    </div>
  );
}

function RoleForm({ user, roles }: { user: ManagedUser; roles: readonly Role[] }) {
  const t = useTranslations("admin.users.manage");
  const tc = useTranslations("common");
  const [state, action] = useActionState(changeUserRole, null);
  const id = useId();
  const errors = state?.fieldErrors?.role;
  return (
    <div className="space-y-2">
      <form action={action} key={user.role} className="space-y-2">
        <input type="hidden" name="userId" value={user.id} />
        <label htmlFor={`${id}-role`} className="field-label">
          {t("role")}
        </label>
        <div className="flex flex-wrap gap-2">
          <select
            id={`${id}-role`}
            name="role"
            defaultValue={user.role}
            className="field-input w-auto flex-1"
            aria-invalid={errors ? true : undefined}
            aria-describedby={errors ? `${id}-role-error` : undefined}
          >
            {roles.map((r) => (
              <option key={r} value={r}>
                {tc(`roles.${r}`)}
              </option>
            ))}
          </select>
          <SubmitButton label={t("saveRole")} pendingLabel={tc("saving")} />
        </div>
        <FieldError id={`${id}-role-error`} messages={errors} />
      </form>
      <ActionNotice
        error={state?.error}
        success={state?.data ? t("roleSaved", { name: state.data.name }) : null}
      >
        <StillAssigned result={state} />
      </ActionNotice>
    </div>
  );
}

function RegionForm({ user, regions }: { user: ManagedUser; regions: { id: string; name: string }[] }) {
  const t = useTranslations("admin.users.manage");
  const tc = useTranslations("common");
  const [state, action] = useActionState(changeUserRegion, null);
  const id = useId();
  const errors = state?.fieldErrors?.regionId;
  return (
    <div className="space-y-2">
      <form action={action} key={user.regionId ?? "none"} className="space-y-2">
        <input type="hidden" name="userId" value={user.id} />
        <label htmlFor={`${id}-region`} className="field-label">
          {t("region")}
        </label>
        <div className="flex flex-wrap gap-2">
          <select
            id={`${id}-region`}
            name="regionId"
            defaultValue={user.regionId ?? ""}
            className="field-input w-auto flex-1"
            aria-invalid={errors ? true : undefined}
            aria-describedby={errors ? `${id}-region-error` : undefined}
          >
            <option value="">{t("noRegion")}</option>
            {regions.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </select>
          <SubmitButton label={t("saveRegion")} pendingLabel={tc("saving")} />
        </div>
        <FieldError id={`${id}-region-error`} messages={errors} />
      </form>
      <ActionNotice
        error={state?.error}
        success={state?.data ? t("regionSaved", { name: state.data.name }) : null}
      />
    </div>
  );
}

function StatusForm({ user }: { user: ManagedUser }) {
  const t = useTranslations("admin.users.manage");
  const [state, action] = useActionState(changeUserStatus, null);
  const [confirming, setConfirming] = useState(false);
  const questionRef = useRef<HTMLParagraphElement>(null);
  const openRef = useRef<HTMLButtonElement>(null);
  const deactivating = user.status !== "deactivated";
  const wasConfirming = useRef(false);

  useEffect(() => {
    if (confirming) questionRef.current?.focus();
    else if (wasConfirming.current) openRef.current?.focus();
    wasConfirming.current = confirming;
  }, [confirming]);

  // A finished action closes the confirmation, whatever its outcome.
  useEffect(() => {
    if (state) setConfirming(false);
  }, [state]);

  const success = state?.data
    ? t(user.status === "deactivated" ? "deactivated" : "reactivated", { name: state.data.name })
    : null;

  return (
    <form action={action} className="space-y-2">
      <input type="hidden" name="userId" value={user.id} />
      <input type="hidden" name="status" value={deactivating ? "deactivated" : "active"} />
      {confirming ? (
        <div className="space-y-2 rounded-card border-2 border-burn-700 p-3">
          <p ref={questionRef} tabIndex={-1} className="font-semibold">
            {t(deactivating ? "confirmDeactivate" : "confirmReactivate", { name: user.name })}
          </p>
          <div className="flex flex-wrap gap-2">
            <SubmitButton
              className={deactivating ? "btn-danger" : "btn-primary"}
              label={t(deactivating ? "yesDeactivate" : "yesReactivate")}
              pendingLabel={t("working")}
            />
            <button type="button" className="btn-secondary" onClick={() => setConfirming(false)}>
              {t("cancel")}
            </button>
          </div>
        </div>
      ) : (
        <button
          ref={openRef}
          type="button"
          className={deactivating ? "btn-danger" : "btn-secondary"}
          onClick={() => setConfirming(true)}
        >
          {t(deactivating ? "deactivate" : "reactivate")}
        </button>
      )}
      <ActionNotice error={state?.error} success={success} />
    </form>
  );
}
