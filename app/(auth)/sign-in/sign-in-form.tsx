"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { signIn } from "next-auth/react";
import { useTranslations } from "next-intl";
import { useState } from "react";

const KNOWN = ["InvalidInput", "WrongCredentials", "TooManyAttempts", "Deactivated", "SessionRequired"];

export function SignInForm({ initialError, returnTo }: { initialError: string | null; returnTo: string }) {
  const t = useTranslations("auth.signIn");
  const router = useRouter();
  const [error, setError] = useState<string | null>(initialError);
  const [pending, setPending] = useState(false);

  const message = (code: string) => t(`errors.${KNOWN.includes(code) ? code : "default"}`);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    if (!navigator.onLine) {
      setError("offline");
      return;
    }
    const form = new FormData(e.currentTarget);
    setPending(true);
    setError(null);
    try {
      const res = await signIn("credentials", {
        redirect: false,
        email: String(form.get("email") ?? ""),
        password: String(form.get("password") ?? ""),
      });
      if (!res || res.error) {
        setError(res?.error ?? "default");
        return;
      }
      router.replace(returnTo);
      router.refresh();
    } catch {
      setError("default");
    } finally {
      setPending(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {error ? (
        <p className="notice-error" role="alert">
          {error === "offline" ? t("offline") : message(error)}
        </p>
      ) : null}
      <div>
        <label htmlFor="email" className="field-label">
          {t("email")}
        </label>
        <input
          id="email"
          name="email"
          type="email"
          autoComplete="username"
          inputMode="email"
          required
          className="field-input"
        />
      </div>
      <div>
        <label htmlFor="password" className="field-label">
          {t("password")}
        </label>
        <input
          id="password"
          name="password"
          type="password"
          autoComplete="current-password"
          required
          className="field-input"
        />
      </div>
      <button type="submit" className="btn-primary w-full" disabled={pending} aria-busy={pending}>
        {pending ? t("submitting") : t("submit")}
      </button>
      <p className="text-center">
        <Link href="/reset-password" className="font-semibold text-water-700 underline">
          {t("forgot")}
        </Link>
      </p>
    </form>
  );
}
