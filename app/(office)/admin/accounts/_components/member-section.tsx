"use client";

import { useTranslations } from "next-intl";
import { useActionState, useId } from "react";
import type { MemberKind } from "@/lib/admin/schemas";
import { ActionNotice, FieldError } from "../../_components/action-notice";
import { SubmitButton } from "../../_components/submit-button";
import { assignMemberAction, unassignMemberAction } from "../actions";

interface Member {
  id: string;
  name: string;
  email: string;
  status: "invited" | "active" | "deactivated";
  regionId: string | null;
}

// The reps (or growers) of one account: who is on it, removing them, and adding someone eligible.
export function MemberSection({
  accountId,
  regionId,
  kind,
  members,
  candidates,
}: {
  accountId: string;
  regionId: string;
  kind: MemberKind;
  members: Member[];
  candidates: Member[];
}) {
  const t = useTranslations(`admin.accounts.members.${kind}`);
  const tm = useTranslations("admin.accounts.members");
  const tc = useTranslations("common");
  const [added, addAction] = useActionState(assignMemberAction, null);
  const [removed, removeAction] = useActionState(unassignMemberAction, null);
  const id = useId();
  const addErrors = added?.fieldErrors?.userId;

  return (
    <section aria-labelledby={`${id}-heading`} className="card space-y-4">
      <h2 id={`${id}-heading`}>{t("heading")}</h2>
      {members.length === 0 ? (
        <p className="text-soil-700">{t("none")}</p>
      ) : (
        <ul className="divide-y divide-soil-200">
          {members.map((m) => (
            <li key={m.id} className="flex flex-wrap items-center justify-between gap-3 py-3">
              <div>
                <p className="font-semibold">{m.name}</p>
                <p className="break-all text-sm text-soil-700">{m.email}</p>
                {m.status !== "active" ? <p className="text-sm">{tc(`status.${m.status}`)}</p> : null}
                {kind === "rep" && m.regionId !== regionId ? (
                  <p className="text-sm font-semibold text-caution-700">{tm("otherRegion")}</p>
                ) : null}
              </div>
              <form action={removeAction}>
                <input type="hidden" name="accountId" value={accountId} />
                <input type="hidden" name="userId" value={m.id} />
                <input type="hidden" name="kind" value={kind} />
                <SubmitButton
                  className="btn-secondary"
                  label={
                    <>
                      {tm("remove")}
                      <span className="sr-only"> {m.name}</span>
                    </>
                  }
                  pendingLabel={tm("removing")}
                />
              </form>
            </li>
          ))}
        </ul>
      )}
      <ActionNotice
        error={removed?.error}
        success={removed?.data ? tm("removed", { name: removed.data.name }) : null}
      />

      {candidates.length === 0 ? (
        <p className="notice-caution">{t("noCandidates")}</p>
      ) : (
        <form action={addAction} className="space-y-2" noValidate>
          <input type="hidden" name="accountId" value={accountId} />
          <input type="hidden" name="kind" value={kind} />
          <label htmlFor={`${id}-user`} className="field-label">
            {t("add")}
          </label>
          <div className="flex flex-wrap gap-2">
            <select
              id={`${id}-user`}
              name="userId"
              defaultValue=""
              className="field-input w-auto flex-1"
              aria-invalid={addErrors ? true : undefined}
              aria-describedby={addErrors ? `${id}-user-error` : undefined}
            >
              <option value="">{tm("choose")}</option>
              {candidates.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.status === "invited" ? `${c.name} (${tc("status.invited")})` : c.name}
                </option>
              ))}
            </select>
            <SubmitButton label={t("assign")} pendingLabel={tm("assigning")} />
          </div>
          <FieldError id={`${id}-user-error`} messages={addErrors} />
        </form>
      )}
      <ActionNotice
        error={added?.error}
        success={added?.data ? tm("assigned", { name: added.data.name }) : null}
      />
    </section>
  );
}
