"use client";

import { useTranslations } from "next-intl";
import { useId, useState } from "react";

export function ResetRequestForm({ ttlMinutes }: { ttlMinutes: number }) {
  const t = useTranslations("auth.reset");
  const tPassword = useTranslations("auth.newPassword");
  const id = useId();
  const [pending, setPending] = useState(false);
  const [sent, setSent] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [emailError, setEmailError] = useState<string | null>(null);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const email = String(new FormData(e.currentTarget).get("email") ?? "");
    setError(null);
    setEmailError(null);
    if (!navigator.onLine) {
      setError(tPassword("offline"));
      return;
    }
    setPending(true);
    try {
      const res = await fetch("/api/password-resets", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ email }),
      });
      if (res.status === 202) {
        setSent(true);
        return;
      }
      const body = (await res.json().catch(() => ({}))) as { issues?: { path: string; message: string }[] };
      const issue = body.issues?.find((i) => i.path === "email");
      if (issue) setEmailError(issue.message);
      else setError(tPassword("failed"));
    } catch {
      setError(tPassword("failed"));
    } finally {
      setPending(false);
    }
  }

  if (sent) {
    return (
      <p className="notice-ok" role="status">
        {t("requestSent", { minutes: ttlMinutes })}
      </p>
    );
  }

  const errorId = `${id}-email-error`;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {error ? (
        <p className="notice-error" role="alert">
          {error}
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
          autoComplete="username"
          inputMode="email"
          required
          className="field-input"
          aria-invalid={emailError ? true : undefined}
          aria-describedby={emailError ? errorId : undefined}
        />
        {emailError ? (
          <p id={errorId} className="field-error">
            {emailError}
          </p>
        ) : null}
      </div>
      <button type="submit" className="btn-primary w-full" disabled={pending} aria-busy={pending}>
        {pending ? t("requestSubmitting") : t("requestSubmit")}
      </button>
    </form>
  );
}
