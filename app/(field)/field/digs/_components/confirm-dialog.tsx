"use client";

import { useEffect, useRef } from "react";

// A yes/no question in a modal dialog (native <dialog>: focus is trapped and Escape cancels).
export function ConfirmDialog({
  open,
  title,
  body,
  confirmLabel,
  cancelLabel,
  onConfirm,
  onCancel,
}: {
  open: boolean;
  title: string;
  body: string;
  confirmLabel: string;
  cancelLabel: string;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) dialog.showModal();
    if (!open && dialog.open) dialog.close();
  }, [open]);
  return (
    <dialog
      ref={ref}
      aria-label={title}
      onCancel={(e) => {
        e.preventDefault();
        onCancel();
      }}
      className="m-auto w-[min(30rem,calc(100vw-2rem))] rounded-card border-2 border-soil-700 bg-white p-0 text-soil-900 backdrop:bg-soil-900/70"
    >
      {open ? (
        <div className="p-gutter">
          <h2>{title}</h2>
          <p className="mt-2">{body}</p>
          <div className="mt-4 flex flex-col gap-2 sm:flex-row sm:justify-end">
            {/* First, so the dialog opens on the safe answer. */}
            <button type="button" className="btn-secondary" onClick={onCancel}>
              {cancelLabel}
            </button>
            <button type="button" className="btn-danger" onClick={onConfirm}>
              {confirmLabel}
            </button>
          </div>
        </div>
      ) : null}
    </dialog>
  );
}
