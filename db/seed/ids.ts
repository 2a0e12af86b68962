import "server-only";
import { createHash } from "node:crypto";

// The demo seed must come out the same on every machine: ids are derived from names and every
// random-looking number comes from a seeded generator, never from Math.random or randomUUID.

/** The version every synced demo row is written at; the region's sync cursor starts there. */
export const SEED_VERSION = 1;

/** A stable UUID (RFC 9562 version 8, name-based) for a demo row of `kind` named `key`. */
export function demoId(kind: string, key: string): string {
  const bytes = createHash("sha256").update(`trenchbook-demo:${kind}:${key}`).digest();
  bytes[6] = (bytes[6]! & 0x0f) | 0x80;
  bytes[8] = (bytes[8]! & 0x3f) | 0x80;
  const hex = bytes.subarray(0, 16).toString("hex");
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20, 32)}`;
}

export interface Random {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform in [min, max). */
  between(min: number, max: number): number;
  /** Uniform integer in [min, max]. */
  int(min: number, max: number): number;
  /** Roughly normal, mean 0 and standard deviation 1 (sum of four uniforms, rescaled). */
  normal(): number;
  pick<T>(items: readonly T[]): T;
}

/** A small deterministic generator (mulberry32) for the demo numbers. */
export function createRandom(seed: number): Random {
  let state = seed >>> 0;
  const next = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
  return {
    next,
    between: (min, max) => min + (max - min) * next(),
    int: (min, max) => min + Math.floor((max - min + 1) * next()),
    // Four uniforms have variance 4/12; dividing the centred sum by sqrt(1/3) gives variance 1.
    normal: () => (next() + next() + next() + next() - 2) / Math.sqrt(1 / 3),
    pick: (items) => {
      if (items.length === 0) throw new Error("pick from an empty list");
      return items[Math.floor(next() * items.length)]!;
    },
  };
}

/** Rounds to `digits` decimals. */
export function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}
