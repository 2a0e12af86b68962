"use client";

import { useTranslations } from "next-intl";
import { FieldError } from "@/app/(office)/admin/_components/action-notice";

// Labelled inputs for the field page's forms; a field's error sits under it and is tied to it with
// aria-invalid and aria-describedby.

interface Common {
  id: string;
  name: string;
  label: string;
  errors?: string[];
  hint?: string;
  optional?: boolean;
}

function described(id: string, errors?: string[], hint?: string) {
  const ids = [hint ? `${id}-hint` : null, errors?.length ? `${id}-error` : null].filter(Boolean);
  return ids.length ? ids.join(" ") : undefined;
}

function Label({ id, label, optional }: Pick<Common, "id" | "label" | "optional">) {
  const t = useTranslations("fieldPage");
  return (
    <label htmlFor={id} className="field-label">
      {label}
      {optional ? <span className="font-normal text-soil-700"> ({t("optional")})</span> : null}
    </label>
  );
}

export function InputField({
  id,
  name,
  label,
  errors,
  hint,
  optional,
  ...input
}: Common & Omit<React.InputHTMLAttributes<HTMLInputElement>, "id" | "name">) {
  return (
    <div>
      <Label id={id} label={label} optional={optional} />
      <input
        id={id}
        name={name}
        className="field-input"
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={described(id, errors, hint)}
        {...input}
      />
      {hint ? (
        <p id={`${id}-hint`} className="mt-1 text-sm text-soil-700">
          {hint}
        </p>
      ) : null}
      <FieldError id={`${id}-error`} messages={errors} />
    </div>
  );
}

export function SelectField({
  id,
  name,
  label,
  errors,
  hint,
  optional,
  options,
  ...select
}: Common & {
  options: { value: string; label: string }[];
} & Omit<React.SelectHTMLAttributes<HTMLSelectElement>, "id" | "name">) {
  return (
    <div>
      <Label id={id} label={label} optional={optional} />
      <select
        id={id}
        name={name}
        className="field-input"
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={described(id, errors, hint)}
        {...select}
      >
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
      <FieldError id={`${id}-error`} messages={errors} />
    </div>
  );
}

export function TextAreaField({
  id,
  name,
  label,
  errors,
  hint,
  optional,
  ...area
}: Common & Omit<React.TextareaHTMLAttributes<HTMLTextAreaElement>, "id" | "name">) {
  return (
    <div className="sm:col-span-2">
      <Label id={id} label={label} optional={optional} />
      <textarea
        id={id}
        name={name}
        rows={2}
        className="field-input py-2"
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={described(id, errors, hint)}
        {...area}
      />
      <FieldError id={`${id}-error`} messages={errors} />
    </div>
  );
}
