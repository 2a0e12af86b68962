"use client";

import { useId } from "react";
import type { FieldError, UseFormRegisterReturn } from "react-hook-form";

// Labelled inputs for the dig form: every input has a visible label, its hint and error are tied to it
// with aria-describedby, and an error marks it aria-invalid. Large targets for gloved thumbs.

export function describedBy(...ids: (string | false | null | undefined)[]): string | undefined {
  const joined = ids.filter(Boolean).join(" ");
  return joined === "" ? undefined : joined;
}

export function FieldMessage({ id, error }: { id: string; error?: FieldError | { message?: string } }) {
  if (!error?.message) return null;
  return (
    <p id={id} className="field-error">
      {error.message}
    </p>
  );
}

export function TextInput({
  label,
  unit,
  hint,
  error,
  registration,
  inputMode = "text",
  type = "text",
  className,
}: {
  label: string;
  unit?: string;
  hint?: string;
  error?: FieldError;
  registration: UseFormRegisterReturn;
  inputMode?: "text" | "decimal" | "numeric";
  type?: "text" | "datetime-local";
  className?: string;
}) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
        {unit ? <span className="font-normal text-soil-700"> ({unit})</span> : null}
      </label>
      <input
        id={id}
        type={type}
        inputMode={type === "text" ? inputMode : undefined}
        autoComplete="off"
        className="field-input"
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(hint && `${id}-hint`, error && `${id}-error`)}
        {...registration}
      />
      {hint ? (
        <p id={`${id}-hint`} className="mt-1 text-sm text-soil-700">
          {hint}
        </p>
      ) : null}
      <FieldMessage id={`${id}-error`} error={error} />
    </div>
  );
}

export function SelectInput({
  label,
  hint,
  error,
  registration,
  options,
  placeholder,
  className,
}: {
  label: string;
  hint?: string;
  error?: FieldError;
  registration: UseFormRegisterReturn;
  options: readonly { value: string; label: string }[];
  placeholder?: string;
  className?: string;
}) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select
        id={id}
        className="field-input"
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(hint && `${id}-hint`, error && `${id}-error`)}
        {...registration}
      >
        {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {hint ? (
        <p id={`${id}-hint`} className="mt-1 text-sm text-soil-700">
          {hint}
        </p>
      ) : null}
      <FieldMessage id={`${id}-error`} error={error} />
    </div>
  );
}

// A set of large radio buttons in a fieldset whose legend is the question.
export function RadioChoices({
  legend,
  hint,
  error,
  registration,
  options,
  columns = 2,
}: {
  legend: string;
  hint?: string;
  error?: FieldError;
  registration: UseFormRegisterReturn;
  options: readonly { value: string; label: string; detail?: string }[];
  columns?: 1 | 2 | 3 | 4;
}) {
  const id = useId();
  const grid = { 1: "grid-cols-1", 2: "grid-cols-2", 3: "grid-cols-3", 4: "grid-cols-2 sm:grid-cols-4" }[
    columns
  ];
  return (
    <fieldset aria-describedby={describedBy(hint && `${id}-hint`, error && `${id}-error`)}>
      <legend className="field-label">{legend}</legend>
      {hint ? (
        <p id={`${id}-hint`} className="mb-2 text-sm text-soil-700">
          {hint}
        </p>
      ) : null}
      <div className={`grid gap-2 ${grid}`}>
        {options.map((o) => (
          <label
            key={o.value}
            className="flex min-h-tap cursor-pointer items-start gap-3 rounded-lg border-2 border-soil-500 bg-white px-3 py-2 has-checked:border-sprout-900 has-checked:bg-sprout-50 has-focus-visible:outline-3 has-focus-visible:outline-water-500"
          >
            <input
              type="radio"
              value={o.value}
              className="mt-1 size-5 shrink-0 accent-sprout-700"
              aria-invalid={error ? true : undefined}
              {...registration}
            />
            <span>
              <span className="font-semibold">{o.label}</span>
              {o.detail ? <span className="block text-sm text-soil-700">{o.detail}</span> : null}
            </span>
          </label>
        ))}
      </div>
      <FieldMessage id={`${id}-error`} error={error} />
    </fieldset>
  );
}

export function TextArea({
  label,
  hint,
  error,
  registration,
  rows = 4,
  maxLength,
}: {
  label: string;
  hint?: string;
  error?: FieldError;
  registration: UseFormRegisterReturn;
  rows?: number;
  maxLength?: number;
}) {
  const id = useId();
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <textarea
        id={id}
        rows={rows}
        maxLength={maxLength}
        className="field-input py-2"
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(hint && `${id}-hint`, error && `${id}-error`)}
        {...registration}
      />
      {hint ? (
        <p id={`${id}-hint`} className="mt-1 text-sm text-soil-700">
          {hint}
        </p>
      ) : null}
      <FieldMessage id={`${id}-error`} error={error} />
    </div>
  );
}
