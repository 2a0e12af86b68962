"use client";

// The outcome of a form's server action: a polite status for success, an alert for failure. The
// status region is always present so assistive technology notices when its text changes.
export function ActionNotice({
  error,
  success,
  children,
}: {
  error?: string | null;
  success?: string | null;
  children?: React.ReactNode;
}) {
  return (
    <>
      <div role="status" className={success ? "notice-ok" : "sr-only"}>
        {success ?? ""}
        {success ? children : null}
      </div>
      {error ? (
        <p role="alert" className="notice-error">
          {error}
        </p>
      ) : null}
    </>
  );
}

// The message under a field, tied to it with aria-describedby.
export function FieldError({ id, messages }: { id: string; messages?: string[] }) {
  if (!messages?.length) return null;
  return (
    <p id={id} className="field-error">
      {messages.join(" ")}
    </p>
  );
}
