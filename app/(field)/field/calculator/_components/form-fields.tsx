"use client";

import { parseLengthInches } from "@/lib/agronomy";
import { useTranslations } from "next-intl";
import { useId, useState } from "react";

export interface NumberSpec {
  min: number;
  max: number;
  unit: string;
  integer?: boolean;
  // Accept field entries such as "1 1/2", "3/4 in" or "4 cm" and read them as inches.
  length?: boolean;
  optional?: boolean;
}

export type Parsed = { value: number | null; error: string | null };

type T = (key: string, values?: Record<string, string | number>) => string;

export function parseNumberEntry(raw: string, spec: NumberSpec, t: T): Parsed {
  const text = raw.trim();
  if (text === "")
    return spec.optional ? { value: null, error: null } : { value: null, error: t("required") };
  let value: number;
  if (spec.length) {
    const parsed = parseLengthInches(text);
    if (!parsed.ok) return { value: null, error: parsed.error };
    value = parsed.value;
  } else {
    const normalized = text.replace(",", ".");
    if (!/^-?\d*\.?\d+$/.test(normalized)) return { value: null, error: t("notNumber") };
    value = Number(normalized);
  }
  if (spec.integer && !Number.isInteger(value)) return { value: null, error: t("wholeNumber") };
  if (value < spec.min || value > spec.max) {
    return { value: null, error: t("range", { min: spec.min, max: spec.max, unit: spec.unit }) };
  }
  return { value, error: null };
}

// A text field for a number with its unit, a hint and an error shown at the field once touched.
export function NumberField({
  label,
  hint,
  value,
  onChange,
  spec,
}: {
  label: string;
  hint?: string;
  value: string;
  onChange: (v: string) => void;
  spec: NumberSpec;
}) {
  const t = useTranslations("field.calculator.errors");
  const id = useId();
  const [touched, setTouched] = useState(false);
  const { error } = parseNumberEntry(value, spec, t);
  const shown = touched || value.trim() !== "" ? error : null;
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label} <span className="font-normal text-soil-700">({spec.unit})</span>
      </label>
      <input
        id={id}
        type="text"
        inputMode={spec.length ? "text" : "decimal"}
        autoComplete="off"
        value={value}
        onChange={(e) => onChange(e.target.value)}
        onBlur={() => setTouched(true)}
        aria-invalid={shown ? true : undefined}
        aria-describedby={
          [hint ? `${id}-hint` : "", shown ? `${id}-error` : ""].join(" ").trim() || undefined
        }
        className="field-input"
      />
      {hint ? (
        <p id={`${id}-hint`} className="mt-1 text-sm text-soil-700">
          {hint}
        </p>
      ) : null}
      {shown ? (
        <p id={`${id}-error`} className="field-error">
          {shown}
        </p>
      ) : null}
    </div>
  );
}

export function SelectField<V extends string>({
  label,
  value,
  onChange,
  options,
}: {
  label: string;
  value: V;
  onChange: (v: V) => void;
  options: readonly { value: V; label: string }[];
}) {
  const id = useId();
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select id={id} value={value} onChange={(e) => onChange(e.target.value as V)} className="field-input">
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </div>
  );
}

// Runs a computation from the agronomy core; a RangeError (an entry it cannot take) becomes a message.
export function compute<R>(fn: () => R): { result: R | null; error: string | null } {
  try {
    return { result: fn(), error: null };
  } catch (err) {
    if (err instanceof RangeError) return { result: null, error: err.message };
    throw err;
  }
}

export function ResultPanel({
  title,
  children,
  formula,
  source,
  error,
  waiting,
}: {
  title: string;
  children?: React.ReactNode;
  formula: string;
  source: string;
  error?: string | null;
  waiting?: boolean;
}) {
  const t = useTranslations("field.calculator");
  return (
    <section aria-label={title} className="mt-4 rounded-card border-2 border-sprout-700 bg-sprout-50 p-4">
      <h3 className="text-lg font-bold">{title}</h3>
      <output aria-live="polite" className="mt-2 block">
        {error ? (
          <span className="font-semibold text-burn-700">{error}</span>
        ) : waiting ? (
          <span className="text-soil-700">{t("waiting")}</span>
        ) : (
          children
        )}
      </output>
      <dl className="mt-3 space-y-1 text-sm text-soil-700">
        <div>
          <dt className="inline font-semibold">{t("formula")}: </dt>
          <dd className="inline">{formula}</dd>
        </div>
        <div>
          <dt className="inline font-semibold">{t("source")}: </dt>
          <dd className="inline">{source}</dd>
        </div>
      </dl>
    </section>
  );
}

export function BigNumber({ value, unit, label }: { value: string; unit: string; label?: string }) {
  return (
    <p>
      {label ? <span className="block text-sm font-semibold text-soil-700">{label}</span> : null}
      <span className="text-3xl font-bold text-sprout-900">{value}</span>{" "}
      <span className="font-semibold">{unit}</span>
    </p>
  );
}

export const fmt = (v: number, digits = 1) =>
  v.toLocaleString("en-US", { maximumFractionDigits: digits, minimumFractionDigits: 0 });
