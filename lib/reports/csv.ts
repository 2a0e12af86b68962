// A spreadsheet opens a cell that starts with = + - @ (or a tab or carriage return) as a formula, so
// text that a rep or grower typed could run in the reader's spreadsheet (CSV formula injection). Such
// cells get a leading apostrophe, which spreadsheets show as text. Numbers are written as numbers.
export function csvCell(value: unknown): string | number | boolean {
  if (value === null || value === undefined) return "";
  if (typeof value === "number" || typeof value === "boolean") return value;
  if (value instanceof Date) return value.toISOString();
  const text = Array.isArray(value) ? value.join(";") : String(value);
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}
