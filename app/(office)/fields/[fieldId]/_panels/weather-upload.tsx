"use client";

import { useRouter } from "next/navigation";
import { useTranslations } from "next-intl";
import { useId, useState } from "react";

// The route refuses bigger bodies; say so before sending.
const MAX_FILE_BYTES = 1024 * 1024;
// Row errors listed on the page; the rest are counted.
const LISTED_ERRORS = 25;

interface RowError {
  row: number;
  code: string;
  params: Record<string, string | number>;
}

type State =
  | { kind: "idle" }
  | { kind: "pending" }
  | { kind: "rowErrors"; errors: RowError[]; total: number }
  | { kind: "failed"; message: string }
  | {
      kind: "done";
      imported: number;
      replaced: number;
      firstDay: string;
      lastDay: string;
      stationName: string;
      createdStation: boolean;
    };

export function WeatherUpload({ fieldId }: { fieldId: string }) {
  const t = useTranslations("fieldPage.panels.upload");
  const router = useRouter();
  const id = useId();
  const [state, setState] = useState<State>({ kind: "idle" });
  const [fileError, setFileError] = useState<string | null>(null);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const file = form.get("file");
    const unit = form.get("unit") === "C" ? "C" : "F";
    if (!(file instanceof File) || file.size === 0) {
      setFileError(t("chooseFile"));
      return;
    }
    if (file.size > MAX_FILE_BYTES) {
      setFileError(t("tooLarge"));
      return;
    }
    setFileError(null);
    setState({ kind: "pending" });
    try {
      const csv = await file.text();
      const res = await fetch(`/api/fields/${fieldId}/weather`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ csv, unit }),
      });
      const body = (await res.json().catch(() => ({}))) as Record<string, unknown>;
      if (res.ok) {
        setState({
          kind: "done",
          imported: Number(body.imported),
          replaced: Number(body.replaced),
          firstDay: String(body.firstDay),
          lastDay: String(body.lastDay),
          stationName: String(body.stationName),
          createdStation: body.createdStation === true,
        });
        router.refresh();
      } else if (res.status === 422 && Array.isArray(body.rowErrors)) {
        setState({ kind: "rowErrors", errors: body.rowErrors as RowError[], total: Number(body.errorCount) });
      } else if (res.status === 422 && body.code === "noLocation") {
        setState({ kind: "failed", message: t("noLocation") });
      } else if (res.status === 413) {
        setState({ kind: "failed", message: t("tooLarge") });
      } else if (res.status === 403 || res.status === 404 || res.status === 401) {
        setState({ kind: "failed", message: t("notAllowed") });
      } else {
        setState({ kind: "failed", message: t("failed") });
      }
    } catch {
      setState({ kind: "failed", message: t("offline") });
    }
  }

  const pending = state.kind === "pending";
  const invalid = fileError !== null || state.kind === "rowErrors";
  const describedBy = [
    `${id}-hint`,
    fileError ? `${id}-file-error` : null,
    state.kind === "rowErrors" ? `${id}-rows` : null,
  ]
    .filter(Boolean)
    .join(" ");
  const rowMessage = (e: RowError) => {
    const params = { row: e.row, ...e.params };
    return t.has(`errors.${e.code}`) ? t(`errors.${e.code}`, params) : t("errors.unknown", { row: e.row });
  };

  return (
    <form onSubmit={onSubmit} className="mt-3 grid max-w-xl gap-4" noValidate>
      <div>
        <label htmlFor={`${id}-file`} className="field-label">
          {t("fileLabel")}
        </label>
        <input
          id={`${id}-file`}
          name="file"
          type="file"
          accept=".csv,text/csv,text/plain"
          className="field-input"
          aria-invalid={invalid || undefined}
          aria-describedby={describedBy}
          disabled={pending}
          onChange={() => {
            setFileError(null);
            if (state.kind !== "pending") setState({ kind: "idle" });
          }}
        />
        <p id={`${id}-hint`} className="mt-1 text-sm text-soil-700">
          {t("hint")}
        </p>
        {fileError ? (
          <p id={`${id}-file-error`} className="field-error">
            {fileError}
          </p>
        ) : null}
      </div>
      <div>
        <label htmlFor={`${id}-unit`} className="field-label">
          {t("unitLabel")}
        </label>
        <select id={`${id}-unit`} name="unit" className="field-input" defaultValue="F" disabled={pending}>
          <option value="F">{t("unitF")}</option>
          <option value="C">{t("unitC")}</option>
        </select>
      </div>
      <div>
        <button type="submit" className="btn-primary min-h-tap" disabled={pending} aria-busy={pending}>
          {pending ? t("pending") : t("submit")}
        </button>
      </div>
      <div aria-live="polite">
        {state.kind === "rowErrors" ? (
          <div id={`${id}-rows`} className="notice-error" role="alert">
            <p className="font-semibold">{t("rejected", { count: state.total })}</p>
            <ul className="mt-2 list-disc pl-5">
              {state.errors.slice(0, LISTED_ERRORS).map((e) => (
                <li key={`${e.row}-${e.code}-${String(e.params.column ?? "")}`}>{rowMessage(e)}</li>
              ))}
            </ul>
            {state.total > Math.min(LISTED_ERRORS, state.errors.length) ? (
              <p className="mt-2">
                {t("moreErrors", { count: state.total - Math.min(LISTED_ERRORS, state.errors.length) })}
              </p>
            ) : null}
          </div>
        ) : null}
        {state.kind === "failed" ? (
          <p className="notice-error" role="alert">
            {state.message}
          </p>
        ) : null}
        {state.kind === "done" ? (
          <p className="notice-ok">
            {t("done", {
              count: state.imported,
              replaced: state.replaced,
              first: state.firstDay,
              last: state.lastDay,
              station: state.stationName,
            })}
            {state.createdStation ? ` ${t("createdStation", { station: state.stationName })}` : ""}
          </p>
        ) : null}
      </div>
    </form>
  );
}
