"use client";

import { signOut } from "next-auth/react";

export function SignOutButton({ label }: { label: string }) {
  return (
    <button
      type="button"
      className="min-h-tap rounded-card border-2 border-white px-4 font-semibold hover:bg-sprout-700"
      onClick={() => {
        navigator.serviceWorker?.controller?.postMessage({ type: "CLEAR_FIELD_PAGES" });
        void signOut({ callbackUrl: "/sign-in" });
      }}
    >
      {label}
    </button>
  );
}
