/**
 * The one argument check used by every agronomy function. API misuse (a number out of range, NaN, an
 * unknown option) throws a RangeError whose message names the argument and the allowed range, so a
 * caller's bug surfaces at the call rather than as a silently wrong figure in the field.
 */

export interface NumberRule {
  min?: number;
  max?: number;
  /** When true the minimum itself is not allowed (for example a row spacing must be above 0). */
  minExclusive?: boolean;
  maxExclusive?: boolean;
  integer?: boolean;
  /** Unit named in the message, e.g. "in" or "lb/acre". */
  unit?: string;
}

function describeRule(rule: NumberRule): string {
  const unit = rule.unit ? ` ${rule.unit}` : "";
  const kind = rule.integer ? "a whole number" : "a finite number";
  const { min, max } = rule;
  if (min !== undefined && max !== undefined) {
    const low = rule.minExclusive ? `above ${min}` : `from ${min}`;
    const high = rule.maxExclusive ? `below ${max}` : `to ${max}`;
    return `${kind} ${low} ${high}${unit}`;
  }
  if (min !== undefined) return `${kind} ${rule.minExclusive ? "above" : "of at least"} ${min}${unit}`;
  if (max !== undefined) return `${kind} ${rule.maxExclusive ? "below" : "of at most"} ${max}${unit}`;
  return `${kind}${unit ? ` (${unit.trim()})` : ""}`;
}

/** Builds the RangeError every check throws: "<name> must be <allowed>; got <value>". */
export function argumentError(name: string, allowed: string, value: unknown): RangeError {
  const shown = typeof value === "string" ? JSON.stringify(value) : String(value);
  return new RangeError(`${name} must be ${allowed}; got ${shown}`);
}

/** Returns `value` when it is a finite number inside `rule`, otherwise throws a RangeError. */
export function checkNumber(name: string, value: unknown, rule: NumberRule = {}): number {
  const allowed = describeRule(rule);
  if (typeof value !== "number" || !Number.isFinite(value)) throw argumentError(name, allowed, value);
  if (rule.integer && !Number.isInteger(value)) throw argumentError(name, allowed, value);
  if (rule.min !== undefined && (rule.minExclusive ? value <= rule.min : value < rule.min)) {
    throw argumentError(name, allowed, value);
  }
  if (rule.max !== undefined && (rule.maxExclusive ? value >= rule.max : value > rule.max)) {
    throw argumentError(name, allowed, value);
  }
  return value;
}

/** Returns `value` when it is one of `allowed`, otherwise throws a RangeError listing them. */
export function checkOneOf<T extends string>(name: string, value: unknown, allowed: readonly T[]): T {
  if (typeof value === "string" && (allowed as readonly string[]).includes(value)) return value as T;
  throw argumentError(name, `one of ${allowed.map((a) => `'${a}'`).join(", ")}`, value);
}
