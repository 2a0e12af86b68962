"use client";

import Link from "next/link";
import { useTranslations } from "next-intl";
import { useId, useState } from "react";

type Kind = "invite" | "reset";

const ENDPOINTS: Record<Kind, string> = {
  invite: "/api/invitations/accept",
  reset: "/api/password-resets/complete",
};

type LinkProblem = "invalid" | "expired" | "used";

interface Issue {
  path: string;
  message: string;
}

// Choosing a password from an e-mailed link: the invitation's first password or a reset.
export function NewPasswordForm({
  kind,
  token,
  email,
  minLength,
}: {
  kind: Kind;
  token: string;
  email: string;
  minLength: number;
}) {
  const t = useTranslations("auth.newPassword");
  const tKind = useTranslations(kind === "invite" ? "auth.invite" : "auth.reset");
  const tLink = useTranslations("auth.link");
  const id = useId();
  const [pending, setPending] = useState(false);
  const [done, setDone] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [linkProblem, setLinkProblem] = useState<LinkProblem | null>(null);
  const [fieldErrors, setFieldErrors] = useState<{ password?: string; confirm?: string }>({});

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const password = String(form.get("password") ?? "");
    const confirm = String(form.get("confirm") ?? "");
    setError(null);
    if (password.length < minLength) {
      setFieldErrors({ password: t("tooShort", { min: minLength }) });
      return;
    }
    if (password !== confirm) {
      setFieldErrors({ confirm: t("mismatch") });
      return;
    }
    setFieldErrors({});
    if (!navigator.onLine) {
      setError(t("offline"));
      return;
    }
    setPending(true);
    try {
      const res = await fetch(ENDPOINTS[kind], {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ token, password }),
      });
      if (res.ok) {
        setDone(true);
        return;
      }
      const body = (await res.json().catch(() => ({}))) as {
        error?: string;
        code?: LinkProblem;
        issues?: Issue[];
      };
      if (body.code) {
        setLinkProblem(body.code);
      } else if (res.status === 422 && body.issues?.some((i) => i.path === "password")) {
        setFieldErrors({ password: body.issues.find((i) => i.path === "password")?.message });
      } else if (res.status === 422 && body.issues?.some((i) => i.path === "token")) {
        setLinkProblem("invalid");
      } else {
        setError(t("failed"));
      }
    } catch {
      setError(t("failed"));
    } finally {
      setPending(false);
    }
  }

  if (done) {
    return (
      <div className="space-y-4">
        <p className="notice-ok" role="status">
          {tKind("done")}
        </p>
        <Link href="/sign-in" className="btn-primary w-full">
          {tLink("goSignIn")}
        </Link>
      </div>
    );
  }

  if (linkProblem) {
    return (
      <div className="space-y-4">
        <p className="notice-error" role="alert">
          {tLink(linkProblem)}
        </p>
        <Link href={kind === "invite" ? "/sign-in" : "/reset-password"} className="btn-secondary w-full">
          {kind === "invite" ? tLink("goSignIn") : tLink("requestNew")}
        </Link>
      </div>
    );
  }

  const passwordErrorId = `${id}-password-error`;
  const confirmErrorId = `${id}-confirm-error`;
  const hintId = `${id}-hint`;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {error ? (
        <p className="notice-error" role="alert">
          {error}
        </p>
      ) : null}
      {/* Lets a password manager file the new password under the right sign-in. */}
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      <div>
        <label htmlFor={`${id}-password`} className="field-label">
          {t("password")}
        </label>
        <input
          id={`${id}-password`}
          name="password"
          type="password"
          autoComplete="new-password"
          required
          minLength={minLength}
          className="field-input"
          aria-invalid={fieldErrors.password ? true : undefined}
          aria-describedby={fieldErrors.password ? `${passwordErrorId} ${hintId}` : hintId}
        />
        <p id={hintId} className="mt-1 text-sm text-soil-700">
          {t("hint", { min: minLength })}
        </p>
        {fieldErrors.password ? (
          <p id={passwordErrorId} className="field-error">
            {fieldErrors.password}
          </p>
        ) : null}
      </div>
      <div>
        <label htmlFor={`${id}-confirm`} className="field-label">
          {t("confirm")}
        </label>
        <input
          id={`${id}-confirm`}
          name="confirm"
          type="password"
          autoComplete="new-password"
          required
          className="field-input"
          aria-invalid={fieldErrors.confirm ? true : undefined}
          aria-describedby={fieldErrors.confirm ? confirmErrorId : undefined}
        />
        {fieldErrors.confirm ? (
          <p id={confirmErrorId} className="field-error">
            {fieldErrors.confirm}
          </p>
        ) : null}
      </div>
      <button type="submit" className="btn-primary w-full" disabled={pending} aria-busy={pending}>
        {pending ? t("submitting") : tKind("submit")}
      </button>
    </form>
  );
}
