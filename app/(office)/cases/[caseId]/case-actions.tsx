"use client";

import { useRouter } from "next/navigation";
import { useTranslations } from "next-intl";
import { type FormEvent, useId, useState, useTransition } from "react";
import type { CaseStatus } from "@/db/schema";

// The workflow forms of the case page. Each posts one action to POST /api/cases/:id/events with the
// version the page was rendered at, then re-renders the page from the server. A 409 whose case has
// moved on means someone else changed it: the person is asked to reload rather than overwrite.

const DECISIONS = ["injury_confirmed", "not_injury", "inconclusive"] as const;
const REASON_MIN_CHARS = 10;

interface Person {
  id: string;
  name: string;
}

export interface CaseActionsProps {
  caseId: string;
  version: number;
  status: CaseStatus;
  sharedWithGrower: boolean;
  assignedTo: string | null;
  canDecide: boolean;
  canComment: boolean;
  supervisors: Person[];
}

type FieldErrors = Record<string, string>;
type Outcome =
  | { kind: "idle" }
  | { kind: "done" }
  | { kind: "stale" }
  | { kind: "error"; message: string; form: string };

interface ErrorBody {
  error?: string;
  issues?: { path: string; message: string }[];
  case?: { version: number };
}

export function CaseActions(props: CaseActionsProps) {
  const t = useTranslations("cases.actions");
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const [busy, setBusy] = useState<string | null>(null);
  const [outcome, setOutcome] = useState<Outcome>({ kind: "idle" });
  const [errors, setErrors] = useState<FieldErrors>({});
  const undecided = props.status === "new" || props.status === "in_review";

  async function send(form: string, body: Record<string, unknown>, onDone?: () => void) {
    setBusy(form);
    setErrors({});
    setOutcome({ kind: "idle" });
    try {
      const res = await fetch(`/api/cases/${props.caseId}/events`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ ...body, expectedVersion: props.version }),
      });
      if (res.ok) {
        onDone?.();
        setOutcome({ kind: "done" });
        startTransition(() => router.refresh());
        return;
      }
      const answer = (await res.json().catch(() => ({}))) as ErrorBody;
      if (res.status === 409 && answer.case && answer.case.version !== props.version) {
        setOutcome({ kind: "stale" });
      } else if (res.status === 422 && answer.issues?.length) {
        setErrors(Object.fromEntries(answer.issues.map((i) => [`${form}.${i.path}`, i.message])));
      } else {
        setOutcome({ kind: "error", form, message: answer.error ?? res.statusText });
      }
    } catch {
      setOutcome({ kind: "error", form, message: t("network") });
    } finally {
      setBusy(null);
    }
  }

  const working = busy !== null || pending;
  const submitLabel = (form: string, label: string) => (busy === form ? t("pending") : label);
  const formError = (form: string) =>
    outcome.kind === "error" && outcome.form === form ? (
      <p className="notice-error mt-2" role="alert">
        {t("failed", { message: outcome.message })}
      </p>
    ) : null;

  return (
    <section aria-labelledby="case-actions-heading" className="card space-y-6">
      <h2 id="case-actions-heading">{t("heading")}</h2>
      <div aria-live="polite">
        {outcome.kind === "done" ? (
          <p className="notice-ok" role="status">
            {t("done")}
          </p>
        ) : null}
        {outcome.kind === "stale" ? (
          <div className="notice-caution flex flex-wrap items-center gap-3" role="alert">
            <p>{t("stale")}</p>
            <button
              type="button"
              className="btn-secondary"
              onClick={() => {
                setOutcome({ kind: "idle" });
                startTransition(() => router.refresh());
              }}
            >
              {t("reload")}
            </button>
          </div>
        ) : null}
      </div>

      {props.canDecide && props.status === "new" ? (
        <div>
          <button
            type="button"
            className="btn-secondary"
            disabled={working}
            onClick={() => send("start", { action: "start_review" })}
          >
            {submitLabel("start", t("startReview"))}
          </button>
          {formError("start")}
        </div>
      ) : null}

      {props.canDecide && undecided ? (
        <AssignForm
          {...props}
          working={working}
          busy={busy}
          errors={errors}
          send={send}
          formError={formError}
        />
      ) : null}

      {props.canDecide && undecided ? (
        <DecideForm working={working} busy={busy} errors={errors} send={send} formError={formError} />
      ) : null}

      {props.canDecide && props.status === "decided" ? (
        <div>
          <button
            type="button"
            className="btn-secondary"
            disabled={working}
            onClick={() => send("close", { action: "close" })}
          >
            {submitLabel("close", t("close"))}
          </button>
          {formError("close")}
        </div>
      ) : null}

      {props.canDecide && !undecided ? (
        <ReopenForm working={working} busy={busy} errors={errors} send={send} formError={formError} />
      ) : null}

      {props.canDecide ? (
        <ShareForm
          shared={props.sharedWithGrower}
          working={working}
          busy={busy}
          send={send}
          formError={formError}
        />
      ) : null}

      {props.canComment ? (
        <CommentForm working={working} busy={busy} errors={errors} send={send} formError={formError} />
      ) : null}
    </section>
  );
}

interface FormProps {
  working: boolean;
  busy: string | null;
  errors?: FieldErrors;
  send: (form: string, body: Record<string, unknown>, onDone?: () => void) => Promise<void>;
  formError: (form: string) => React.ReactNode;
}

function FieldError({ id, message }: { id: string; message: string | undefined }) {
  return message ? (
    <p id={id} className="field-error">
      {message}
    </p>
  ) : null;
}

function AssignForm({
  supervisors,
  assignedTo,
  working,
  busy,
  errors = {},
  send,
  formError,
}: FormProps & Pick<CaseActionsProps, "supervisors" | "assignedTo">) {
  const t = useTranslations("cases.actions");
  const id = useId();
  const [value, setValue] = useState(assignedTo ?? "");
  const [local, setLocal] = useState<string | undefined>();
  const error = local ?? errors["assign.userId"];
  function submit(e: FormEvent) {
    e.preventDefault();
    if (!value) {
      setLocal(t("assign.choose"));
      return;
    }
    setLocal(undefined);
    void send("assign", { action: "assign", userId: value });
  }
  return (
    <form onSubmit={submit} noValidate className="space-y-2">
      <label htmlFor={`${id}-assignee`} className="field-label">
        {t("assign.label")}
      </label>
      <div className="flex flex-col gap-3 sm:flex-row">
        <select
          id={`${id}-assignee`}
          value={value}
          onChange={(e) => setValue(e.target.value)}
          className="field-input sm:max-w-sm"
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-assignee-error` : undefined}
        >
          <option value="">{t("assign.choose")}</option>
          {supervisors.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </select>
        <button type="submit" className="btn-secondary" disabled={working}>
          {busy === "assign" ? t("pending") : t("assign.submit")}
        </button>
      </div>
      <FieldError id={`${id}-assignee-error`} message={error} />
      {formError("assign")}
    </form>
  );
}

function DecideForm({ working, busy, errors = {}, send, formError }: FormProps) {
  const t = useTranslations("cases.actions");
  const td = useTranslations("cases.decision");
  const id = useId();
  const [decision, setDecision] = useState("");
  const [reason, setReason] = useState("");
  const [local, setLocal] = useState<FieldErrors>({});
  const decisionError = local.decision ?? errors["decide.decision"];
  const reasonError = local.reason ?? errors["decide.reason"];
  function submit(e: FormEvent) {
    e.preventDefault();
    const found: FieldErrors = {};
    if (!decision) found.decision = t("decide.decisionRequired");
    if (reason.trim().length < REASON_MIN_CHARS) found.reason = t("decide.reasonRequired");
    setLocal(found);
    if (Object.keys(found).length > 0) {
      document.getElementById(found.decision ? `${id}-${DECISIONS[0]}` : `${id}-reason`)?.focus();
      return;
    }
    void send("decide", { action: "decide", decision, reason: reason.trim() }, () => setReason(""));
  }
  return (
    <form onSubmit={submit} noValidate className="space-y-3">
      <fieldset
        aria-invalid={decisionError ? true : undefined}
        aria-describedby={decisionError ? `${id}-decision-error` : undefined}
      >
        <legend className="field-label">{t("decide.legend")}</legend>
        <div className="flex flex-col gap-1 sm:flex-row sm:flex-wrap sm:gap-4">
          {DECISIONS.map((d) => (
            <label key={d} htmlFor={`${id}-${d}`} className="flex min-h-tap items-center gap-3">
              <input
                id={`${id}-${d}`}
                type="radio"
                name="decision"
                value={d}
                checked={decision === d}
                onChange={() => setDecision(d)}
                className="size-6"
              />
              {td(d)}
            </label>
          ))}
        </div>
        <FieldError id={`${id}-decision-error`} message={decisionError} />
      </fieldset>
      <div>
        <label htmlFor={`${id}-reason`} className="field-label">
          {t("decide.reason")}
        </label>
        <p id={`${id}-reason-hint`} className="mb-1 text-sm text-soil-700">
          {t("decide.reasonHint")}
        </p>
        <textarea
          id={`${id}-reason`}
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          rows={4}
          maxLength={4000}
          className="field-input py-2"
          aria-invalid={reasonError ? true : undefined}
          aria-describedby={`${id}-reason-hint${reasonError ? ` ${id}-reason-error` : ""}`}
        />
        <FieldError id={`${id}-reason-error`} message={reasonError} />
      </div>
      <button type="submit" className="btn-primary" disabled={working}>
        {busy === "decide" ? t("pending") : t("decide.submit")}
      </button>
      {formError("decide")}
    </form>
  );
}

function ReopenForm({ working, busy, errors = {}, send, formError }: FormProps) {
  const t = useTranslations("cases.actions");
  const id = useId();
  const [reason, setReason] = useState("");
  const [local, setLocal] = useState<string | undefined>();
  const error = local ?? errors["reopen.reason"];
  function submit(e: FormEvent) {
    e.preventDefault();
    if (reason.trim().length < REASON_MIN_CHARS) {
      setLocal(t("reopen.reasonRequired"));
      document.getElementById(`${id}-reason`)?.focus();
      return;
    }
    setLocal(undefined);
    void send("reopen", { action: "reopen", reason: reason.trim() }, () => setReason(""));
  }
  return (
    <form onSubmit={submit} noValidate className="space-y-2">
      <label htmlFor={`${id}-reason`} className="field-label">
        {t("reopen.reason")}
      </label>
      <textarea
        id={`${id}-reason`}
        value={reason}
        onChange={(e) => setReason(e.target.value)}
        rows={2}
        maxLength={4000}
        className="field-input py-2"
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-reason-error` : undefined}
      />
      <FieldError id={`${id}-reason-error`} message={error} />
      <button type="submit" className="btn-secondary" disabled={working}>
        {busy === "reopen" ? t("pending") : t("reopen.submit")}
      </button>
      {formError("reopen")}
    </form>
  );
}

function ShareForm({ shared, working, busy, send, formError }: FormProps & { shared: boolean }) {
  const t = useTranslations("cases.actions");
  const id = useId();
  const [checked, setChecked] = useState(shared);
  function submit(e: FormEvent) {
    e.preventDefault();
    void send("share", { action: "share", shared: checked });
  }
  return (
    <form onSubmit={submit} className="space-y-2">
      <label htmlFor={`${id}-share`} className="flex min-h-tap items-center gap-3 font-semibold">
        <input
          id={`${id}-share`}
          type="checkbox"
          checked={checked}
          onChange={(e) => setChecked(e.target.checked)}
          className="size-6"
          aria-describedby={`${id}-share-hint`}
        />
        {t("share.label")}
      </label>
      <p id={`${id}-share-hint`} className="text-sm text-soil-700">
        {t("share.hint")}
      </p>
      <button type="submit" className="btn-secondary" disabled={working || checked === shared}>
        {busy === "share" ? t("pending") : t("share.submit")}
      </button>
      {formError("share")}
    </form>
  );
}

function CommentForm({ working, busy, errors = {}, send, formError }: FormProps) {
  const t = useTranslations("cases.actions");
  const id = useId();
  const [body, setBody] = useState("");
  const [local, setLocal] = useState<string | undefined>();
  const error = local ?? errors["comment.body"];
  function submit(e: FormEvent) {
    e.preventDefault();
    if (body.trim().length === 0) {
      setLocal(t("comment.required"));
      document.getElementById(`${id}-body`)?.focus();
      return;
    }
    setLocal(undefined);
    void send("comment", { action: "comment", body: body.trim() }, () => setBody(""));
  }
  return (
    <form onSubmit={submit} noValidate className="space-y-2">
      <label htmlFor={`${id}-body`} className="field-label">
        {t("comment.label")}
      </label>
      <p id={`${id}-body-hint`} className="text-sm text-soil-700">
        {t("comment.hint")}
      </p>
      <textarea
        id={`${id}-body`}
        value={body}
        onChange={(e) => setBody(e.target.value)}
        rows={3}
        maxLength={4000}
        className="field-input py-2"
        aria-invalid={error ? true : undefined}
        aria-describedby={`${id}-body-hint${error ? ` ${id}-body-error` : ""}`}
      />
      <FieldError id={`${id}-body-error`} message={error} />
      <button type="submit" className="btn-secondary" disabled={working}>
        {busy === "comment" ? t("pending") : t("comment.submit")}
      </button>
      {formError("comment")}
    </form>
  );
}
