// Where to go after signing in: only a path on this site, never another origin or the sign-in page.
export const RETURN_TO_HEADER = "x-trenchbook-path";

export function safeReturnPath(value: unknown): string {
  if (typeof value !== "string" || value.length === 0 || value.length > 2000) return "/";
  // "//host" and "/\host" are read by browsers as other origins.
  if (!value.startsWith("/") || value.startsWith("//") || value.startsWith("/\\")) return "/";
  let path: string;
  try {
    path = new URL(value, "http://trenchbook.invalid").pathname;
  } catch {
    return "/";
  }
  if (path === "/sign-in" || path.startsWith("/api/")) return "/";
  return value;
}
