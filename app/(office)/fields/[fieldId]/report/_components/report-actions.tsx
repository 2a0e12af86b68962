"use client";

import { useTranslations } from "next-intl";
import { useState } from "react";

type State =
  | { kind: "idle" }
  | { kind: "sending" }
  | { kind: "sent"; recipients: string[] }
  | { kind: "failed"; error: string }
  | { kind: "error"; message: string };

export function PrintButton() {
  const t = useTranslations("reports");
  return (
    <button type="button" className="btn-secondary print:hidden" onClick={() => window.print()}>
      {t("print")}
    </button>
  );
}

// Sends the report to the account's growers (POST /api/fields/<id>/reports) and says what happened.
export function SendReportButton({ fieldId }: { fieldId: string }) {
  const t = useTranslations("reports");
  const [state, setState] = useState<State>({ kind: "idle" });

  async function send() {
    setState({ kind: "sending" });
    try {
      const res = await fetch(`/api/fields/${fieldId}/reports`, { method: "POST" });
      if (res.status === 409) {
        setState({ kind: "error", message: t("send.noGrower") });
        return;
      }
      if (!res.ok) {
        setState({ kind: "error", message: t("send.error") });
        return;
      }
      const body = (await res.json()) as {
        report: { status: string; recipients: string[]; error: string | null };
      };
      if (body.report.status === "sent") setState({ kind: "sent", recipients: body.report.recipients });
      else setState({ kind: "failed", error: body.report.error ?? "" });
    } catch {
      setState({ kind: "error", message: t("send.error") });
    }
  }

  const pending = state.kind === "sending";
  return (
    <div className="space-y-2 print:hidden">
      <button
        type="button"
        className="btn-primary"
        onClick={send}
        disabled={pending}
        aria-disabled={pending}
        aria-describedby="send-report-hint"
      >
        {pending ? t("send.sending") : state.kind === "idle" ? t("send.button") : t("send.resend")}
      </button>
      <p id="send-report-hint" className="text-sm text-soil-700">
        {t("send.hint")}
      </p>
      <div aria-live="polite">
        {state.kind === "sent" ? (
          <p className="notice-ok">{t("send.sent", { recipients: state.recipients.join(", ") })}</p>
        ) : state.kind === "failed" ? (
          <p className="notice-error">{t("send.failed", { error: state.error })}</p>
        ) : state.kind === "error" ? (
          <p className="notice-error">{state.message}</p>
        ) : null}
      </div>
    </div>
  );
}
