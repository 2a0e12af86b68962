"use client";

import { useFormStatus } from "react-dom";

// A form's submit button that shows the pending label and refuses a second click while it runs.
export function SubmitButton({
  label,
  pendingLabel,
  className = "btn-primary",
  name,
  value,
}: {
  label: React.ReactNode;
  pendingLabel: string;
  className?: string;
  name?: string;
  value?: string;
}) {
  const { pending } = useFormStatus();
  return (
    <button
      type="submit"
      className={className}
      disabled={pending}
      aria-disabled={pending}
      name={name}
      value={value}
    >
      {pending ? pendingLabel : label}
    </button>
  );
}
