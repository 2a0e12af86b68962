// The field-by-field merge rules of sync/server/merge.ts on hand-built rows: which pushed values
// apply, which leave the server's value with no conflict (the device never touched the field) and
// which become a conflict (both sides changed it), by server versions only.
import { describe, expect, it } from "vitest";
import {
  editSinceBase,
  type FieldChange,
  HISTORY,
  mergeFields,
  normalize,
  type StoredRow,
  valueDigest,
} from "@/sync/server/merge";

const A = "client-a";
const B = "client-b";

const change = (version: number, client: string | null, value: unknown): FieldChange => ({
  version,
  client,
  user: client === null ? null : `user-${client}`,
  at: new Date(Date.UTC(2026, 4, 1, 12, version)).toISOString(),
  digest: valueDigest(value),
});

const dig = {
  id: "d1",
  fieldId: "f1",
  plantingId: null,
  dugAt: new Date("2026-05-14T17:20:00Z"),
  latitude: null,
  longitude: null,
  accuracyM: null,
  soilMoisture: "moist",
  soilTempF: 61,
  irrigatedYet: false,
  recommendation: null,
  flaggedByRep: false,
  notes: "first look",
};

// A dig created by A at version 10 whose notes then changed as `notes` lists (newest first).
function stored(notes: FieldChange[], current: string): StoredRow {
  const created = Object.fromEntries(
    Object.entries(dig)
      .filter(([k]) => k !== "id")
      .map(([k, v]) => [k, [change(10, A, normalize(k, v))]]),
  );
  return {
    ...dig,
    notes: current,
    version: notes[0]?.version ?? 10,
    fieldVersions: Object.fromEntries([
      ...Object.keys(created).map((k) => [k, 10]),
      ["notes", notes[0]?.version ?? 10],
    ]),
    fieldChanges: { ...created, notes: [...notes, change(10, A, "first look")].slice(0, HISTORY) },
    updatedBy: "user-x",
    updatedAt: new Date("2026-05-02T00:00:00Z"),
    deletedAt: null,
  };
}

const pushed = (notes: string, over: Record<string, unknown> = {}) => ({
  ...dig,
  dugAt: "2026-05-14T10:20:00-07:00",
  notes,
  ...over,
});

describe("mergeFields", () => {
  it("applies a field the server has not changed since the device's base", () => {
    const row = stored([], "first look");
    expect(mergeFields("digSite", row, pushed("second look"), 10, B)).toEqual({
      patch: { notes: "second look" },
      conflicts: [],
    });
  });

  it("compares instants, not their offsets: the same dugAt in another offset is no change", () => {
    const row = stored([], "first look");
    expect(mergeFields("digSite", row, pushed("first look"), 10, B).patch).toEqual({});
  });

  it("applies a device's second edit of a field it changed last, though its base is older", () => {
    const row = stored([change(12, A, "A one")], "A one");
    expect(mergeFields("digSite", row, pushed("A two"), 10, A)).toEqual({
      patch: { notes: "A two" },
      conflicts: [],
    });
  });

  it("keeps the server's newer value without a conflict when the device still holds the value at its base", () => {
    const row = stored([change(12, A, "A's note")], "A's note");
    const merge = mergeFields("digSite", row, pushed("first look", { soilMoisture: "wet" }), 10, B);
    expect(merge).toEqual({ patch: { soilMoisture: "wet" }, conflicts: [] });
  });

  it("keeps the server's value and reports a conflict when both changed the field", () => {
    const row = stored([change(12, A, "A's note")], "A's note");
    expect(mergeFields("digSite", row, pushed("B's note"), 10, B)).toEqual({
      patch: {},
      conflicts: [
        {
          field: "notes",
          serverValue: "A's note",
          clientValue: "B's note",
          serverUserId: "user-client-a",
          serverChangedAt: change(12, A, "").at,
        },
      ],
    });
  });

  it("recognises a device's own earlier value that another device changed after seeing it", () => {
    // B wrote "B's" at 12 on base 10; C (having pulled 12) wrote "C's" at 14; B pushes again from base 10.
    const row = stored([change(14, "client-c", "C's"), change(12, B, "B's")], "C's");
    expect(mergeFields("digSite", row, pushed("B's"), 10, B)).toEqual({ patch: {}, conflicts: [] });
    expect(mergeFields("digSite", row, pushed("B's again"), 10, B).conflicts).toHaveLength(1);
  });

  it("counts a field whose history does not reach the base as changed by someone else", () => {
    const many = Array.from({ length: HISTORY }, (_, i) => change(30 - i, A, `v${30 - i}`));
    const row = stored(many, "v30");
    expect(row.fieldChanges.notes).toHaveLength(HISTORY);
    expect(mergeFields("digSite", row, pushed("first look"), 10, B).conflicts).toHaveLength(1);
  });

  it("counts a value written outside sync (no matching history) as changed by someone else", () => {
    const row = {
      ...stored([], "first look"),
      notes: "office edit",
      fieldVersions: { ...stored([], "").fieldVersions, notes: 20 },
    };
    expect(mergeFields("digSite", row, pushed("first look"), 10, B).conflicts).toHaveLength(1);
    expect(mergeFields("digSite", row, pushed("first look"), 20, B)).toEqual({
      patch: { notes: "first look" },
      conflicts: [],
    });
  });
});

describe("editSinceBase", () => {
  it("finds another device's edit after the base, and ignores the deleting device's own", () => {
    const byA = stored([change(12, A, "A's note")], "A's note");
    expect(editSinceBase("digSite", byA, 10, B)).toEqual({
      userId: "user-client-a",
      at: change(12, A, "").at,
    });
    expect(editSinceBase("digSite", byA, 10, A)).toBeNull();
    expect(editSinceBase("digSite", byA, 12, B)).toBeNull();
    expect(editSinceBase("digSite", stored([], "first look"), null, A)).toBeNull();
  });
});
