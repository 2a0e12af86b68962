import { createHash } from "node:crypto";
import { statSync } from "node:fs";
import path from "node:path";
import AxeBuilder from "@axe-core/playwright";
import { type Browser, type BrowserContext, devices, expect, type Page, test } from "@playwright/test";
import { type AssessmentPlant, assessLocalDig } from "../../lib/digs/assessment";
import { signInAs, waitForOfflineReady } from "../helpers/browser";

// A rep records a whole root dig in airplane mode after one online visit: three plants, two photos
// compressed on the phone, the live summary, and the save that lands records and outbox entries in
// IndexedDB together. Drafts, a full disk and accessibility are checked on the same screen.

const FIXTURES = path.resolve(import.meta.dirname, "..", "fixtures");
const LANDSCAPE = path.join(FIXTURES, "roots-landscape.jpg"); // 2400 × 1300
const PORTRAIT = path.join(FIXTURES, "roots-portrait.jpg"); // 1200 × 1800

interface FieldRow {
  id: string;
  name: string;
  centroidLat: number | null;
  centroidLon: number | null;
}

async function readStore<T>(page: Page, store: string): Promise<T[]> {
  return page.evaluate(async (name) => {
    // Opening a database that does not exist yet would create it empty: wait for the app's.
    if (!(await indexedDB.databases()).some((d) => d.name === "trenchbook")) return [];
    return new Promise<T[]>((resolve, reject) => {
      const open = indexedDB.open("trenchbook");
      open.onerror = () => reject(open.error);
      open.onsuccess = () => {
        const db = open.result;
        if (!db.objectStoreNames.contains(name)) {
          db.close();
          resolve([]);
          return;
        }
        const req = db.transaction(name, "readonly").objectStore(name).getAll();
        req.onsuccess = () => {
          db.close();
          // Bytes stay in the page; only their size crosses over.
          const rows = (req.result as Record<string, unknown>[]).map((row) =>
            JSON.parse(
              JSON.stringify(row, (_k, v) => (v instanceof ArrayBuffer ? { byteLength: v.byteLength } : v)),
            ),
          );
          resolve(rows as T[]);
        };
        req.onerror = () => reject(req.error);
      };
    });
  }, store);
}

// The stored photo bytes, base64-encoded to cross into Node, with the size the browser decodes.
async function readPhotoBytes(page: Page) {
  return page.evaluate(
    () =>
      new Promise<{ id: string; base64: string; width: number; height: number }[]>((resolve, reject) => {
        const open = indexedDB.open("trenchbook");
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const db = open.result;
          const req = db.transaction("photoBytes", "readonly").objectStore("photoBytes").getAll();
          req.onerror = () => reject(req.error);
          req.onsuccess = async () => {
            db.close();
            const rows = req.result as { id: string; bytes: ArrayBuffer }[];
            const out = [];
            for (const row of rows) {
              const bitmap = await createImageBitmap(new Blob([row.bytes]));
              let binary = "";
              const view = new Uint8Array(row.bytes);
              for (let i = 0; i < view.length; i += 0x8000) {
                binary += String.fromCharCode(...view.subarray(i, i + 0x8000));
              }
              out.push({ id: row.id, base64: btoa(binary), width: bitmap.width, height: bitmap.height });
              bitmap.close();
            }
            resolve(out);
          };
        };
      }),
  );
}

// One online visit: sign in, let Today pull the rep's accounts, fields and plantings into the phone's
// database, then store the new-dig page for offline use.
async function preparePhone(browser: Browser, options: { at?: FieldRow } = {}) {
  const context = await browser.newContext({
    ...devices["Pixel 7"],
    permissions: ["geolocation"],
    geolocation: { latitude: 0, longitude: 0, accuracy: 5 },
  });
  const page = await context.newPage();
  await signInAs(page, "rep1");
  await page.goto("/field");
  await expect
    .poll(async () => (await readStore<FieldRow>(page, "fields")).length, { timeout: 30_000 })
    .toBeGreaterThan(0);
  const fields = await readStore<FieldRow>(page, "fields");
  const plantings = await readStore<{ fieldId: string }>(page, "plantings");
  const field =
    options.at ??
    fields.find((f) => f.centroidLat !== null && plantings.some((p) => p.fieldId === f.id)) ??
    fields[0]!;
  if (field.centroidLat !== null && field.centroidLon !== null) {
    await context.setGeolocation({ latitude: field.centroidLat, longitude: field.centroidLon, accuracy: 6 });
  }
  await page.goto("/field/digs/new");
  await expect(page.getByRole("heading", { level: 1, name: "New dig" })).toBeVisible();
  await waitForOfflineReady(page, "/field/digs/new", "/field/digs/edit");
  return { context, page, field };
}

async function goOffline(context: BrowserContext, page: Page) {
  await context.setOffline(true);
  await page.reload();
  await expect(page.getByRole("heading", { level: 1, name: "New dig" })).toBeVisible();
}

async function acknowledgeCautions(page: Page) {
  const dialog = page.getByRole("dialog", { name: "Before you dig today" });
  await expect(dialog).toBeVisible();
  await expect(dialog.getByText(/Call 811/)).toBeVisible();
  await expect(dialog.getByText(/buried irrigation lines/)).toBeVisible();
  await expect(dialog.getByText(/gloves when you handle treated seed/)).toBeVisible();
  await dialog.getByRole("button", { name: "I have read these — start" }).click();
  await expect(dialog).toBeHidden();
}

async function chooseField(page: Page, field: FieldRow) {
  await page.getByLabel("Field", { exact: true }).selectOption(field.id);
  const planting = page.getByLabel("Planting", { exact: true });
  if ((await planting.count()) > 0 && (await planting.inputValue()) === "") {
    await planting.selectOption({ index: 1 });
  }
}

async function addPhoto(page: Page, owner: string, file: string, n: number) {
  await page.getByLabel(`Add a photo of ${owner}`).setInputFiles(file);
  await expect(page.getByRole("img", { name: `Photo ${n} of ${owner}` })).toBeVisible({ timeout: 30_000 });
}

const sha256 = (base64: string) => createHash("sha256").update(Buffer.from(base64, "base64")).digest("hex");

test("a rep records a dig with three plants and two photos offline, and finds it intact after reopening", async ({
  browser,
}) => {
  test.setTimeout(120_000);
  const { context, page, field } = await preparePhone(browser);
  await goOffline(context, page);
  await expect(page.getByRole("status").filter({ hasText: "Offline" })).toBeVisible();
  await acknowledgeCautions(page);

  // The field from the phone's position (the browser's location is set to the field's middle).
  await page.getByRole("button", { name: "Nearest to me" }).click();
  await expect(page.getByLabel("Field", { exact: true })).toHaveValue(field.id);
  await expect(page.getByText(new RegExp(`(You are in |Nearest: )${field.name}`))).toBeVisible();
  await chooseField(page, field);
  await expect(page.getByText("Hybrid", { exact: true })).toBeVisible();
  await expect(page.getByText(/Position from the phone, accurate to about 6 m \(20 ft\)/)).toBeVisible();
  await expect(page.getByLabel("Latitude")).toHaveValue(String(Math.round(field.centroidLat! * 1e6) / 1e6));

  await page.getByRole("radio", { name: "Moist" }).check();
  await page.getByLabel("Soil temperature").fill("58");
  await page.getByRole("radio", { name: "Not yet" }).check();

  // Plant 1: burn toward a band half an inch beside the seed.
  const p1 = page.getByRole("region", { name: "Plant 1", exact: true });
  await p1.getByLabel("Leaf stage").selectOption("V3");
  await p1.getByLabel("Seeding depth").fill("1 3/4");
  await p1.getByLabel("Crown depth").fill("3/4");
  await p1.getByLabel("Mesocotyl").selectOption("healthy");
  await p1.getByRole("radio", { name: /^5/ }).check();
  await p1.getByLabel("Nodal whorls").fill("2");
  await p1.getByLabel("Nodal roots counted").fill("9");
  await p1.getByLabel("Longest nodal root").fill("5");
  await p1
    .getByRole("group", { name: "Injury to seminal roots" })
    .getByRole("radio", { name: "Moderate" })
    .check();
  await p1.getByRole("checkbox", { name: /Fertilizer burn/ }).check();
  await p1.getByLabel("Beside the seed").fill("1/2");
  await p1.getByLabel("Below the seed").fill("2");

  // Plant 2: a copy of plant 1, one collar further on, no burn.
  await page.getByRole("button", { name: "Copy last plant" }).click();
  const p2 = page.getByRole("region", { name: "Plant 2", exact: true });
  await expect(p2.getByLabel("Seeding depth")).toHaveValue("1 3/4");
  await p2.getByLabel("Leaf stage").selectOption("V4");
  await p2
    .getByRole("group", { name: "Injury to seminal roots" })
    .getByRole("radio", { name: "None" })
    .check();
  await p2.getByRole("checkbox", { name: /Fertilizer burn/ }).uncheck();

  // Plant 3: only its stage and seeding depth so far.
  await page.getByRole("button", { name: "Add plant" }).click();
  const p3 = page.getByRole("region", { name: "Plant 3", exact: true });
  await p3.getByLabel("Leaf stage").selectOption("V2");
  await p3.getByLabel("Seeding depth").fill("1.5 in");

  // Two photos, compressed on the phone: one of the dig, one of plant 1.
  await addPhoto(page, "the dig", LANDSCAPE, 1);
  await page
    .getByRole("region", { name: /Photos of the dig/ })
    .getByLabel("Caption for photo 1")
    .fill("Row 4, east end");
  await addPhoto(page, "plant 1", PORTRAIT, 1);

  // The live summary is the agronomy core's assessment of what was entered (computed here too). The
  // core's numbers are checked against their published sources in tests/unit/agronomy; this check is
  // that the screen shows what the core computes for these plants.
  const entered: AssessmentPlant = {
    leafStage: "V3",
    seedingDepthIn: 1.75,
    crownDepthIn: 0.75,
    mesocotyl: "healthy",
    seminalScore: 5,
    nodalWhorls: 2,
    nodalCount: 9,
    longestNodalIn: 5,
    seminalInjury: "moderate",
    nodalInjury: "none",
    findings: ["band_burn"],
    bandBesideIn: 0.5,
    bandBelowIn: 2,
  };
  const third: AssessmentPlant = {
    ...entered,
    leafStage: "V2",
    seedingDepthIn: 1.5,
    crownDepthIn: null,
    mesocotyl: null,
    seminalScore: null,
    nodalWhorls: null,
    nodalCount: null,
    longestNodalIn: null,
    seminalInjury: "none",
    findings: [],
    bandBesideIn: null,
    bandBelowIn: null,
  };
  const expected = assessLocalDig(
    { fieldId: field.id, plantingId: null, dugAt: "2026-05-01T10:00:00-07:00" },
    [entered, { ...entered, leafStage: "V4", seminalInjury: "none", findings: [] }, third],
    null,
    [],
    [],
  ).assessment!;
  const summary = page.getByRole("region", { name: "What this dig shows" });
  await expect(summary.getByText(`Site root index ${expected.siteIndex} of 100 for V3`)).toBeVisible();
  await expect(
    summary.getByText(`index ${expected.plants[0]!.index}`, { exact: false }).first(),
  ).toBeVisible();
  await expect(summary.getByText(/Plant 3\s*not scored yet: enter seminal root score/)).toBeVisible();
  // Burn on 1 of the 2 scored plants is half of them: critical (our rule in lib/agronomy injuryFlags).
  await expect(summary.getByText("Fertilizer burn seen on the roots of 1 of 2 plants.")).toBeVisible();
  await expect(summary.getByText("Suggest flagging this dig for your supervisor")).toBeVisible();

  await page.getByLabel("Flag this dig for my supervisor").check();
  const advice =
    "Burned seminal roots toward the starter band on plant 1. Check the band opener before the next field.";
  await page.getByLabel("Recommendation for the grower").fill(advice);
  await page.getByRole("button", { name: "Save dig" }).click();
  await expect(page.getByRole("heading", { name: "Saved on this phone" })).toBeVisible();
  await expect(page.getByRole("link", { name: "See my digs" })).toHaveAttribute("href", "/field/digs");

  // Close the tab and open the app again, still with no signal.
  await page.close();
  const again = await context.newPage();
  await again.goto("/field/digs/new");
  await expect(again.getByRole("heading", { level: 1, name: "New dig" })).toBeVisible();

  type Site = {
    id: string;
    fieldId: string;
    recommendation: string;
    flaggedByRep: boolean;
    soilTempF: number;
    soilMoisture: string;
    irrigatedYet: boolean;
    latitude: number;
    accuracyM: number;
    syncState: string;
  };
  const site = (await readStore<Site>(again, "digSites")).find((s) => s.recommendation === advice);
  expect(site).toMatchObject({
    fieldId: field.id,
    flaggedByRep: true,
    soilTempF: 58,
    soilMoisture: "moist",
    irrigatedYet: false,
    accuracyM: 6,
    syncState: "waiting",
  });
  const plants = (
    await readStore<{
      id: string;
      digSiteId: string;
      position: number;
      leafStage: string;
      seedingDepthIn: number;
      crownDepthIn: number | null;
      bandBesideIn: number | null;
      findings: string[];
      seminalInjury: string;
    }>(again, "dugPlants")
  )
    .filter((p) => p.digSiteId === site!.id)
    .sort((a, b) => a.position - b.position);
  expect(
    plants.map((p) => [p.position, p.leafStage, p.seedingDepthIn, p.crownDepthIn, p.bandBesideIn]),
  ).toEqual([
    [1, "V3", 1.75, 0.75, 0.5],
    [2, "V4", 1.75, 0.75, 0.5],
    [3, "V2", 1.5, null, null],
  ]);
  expect(plants.map((p) => p.findings)).toEqual([["band_burn"], [], []]);
  expect(plants[0]!.seminalInjury).toBe("moderate");

  type Photo = {
    id: string;
    digSiteId: string;
    dugPlantId: string | null;
    sha256: string;
    byteSize: number;
    width: number;
    height: number;
    caption: string | null;
    contentType: string;
    uploaded: number;
  };
  const photos = (await readStore<Photo>(again, "photos")).filter((p) => p.digSiteId === site!.id);
  expect(photos).toHaveLength(2);
  const bytes = new Map((await readPhotoBytes(again)).map((b) => [b.id, b]));
  for (const photo of photos) {
    const stored = bytes.get(photo.id);
    expect(stored, `bytes of photo ${photo.id}`).toBeDefined();
    expect(sha256(stored!.base64)).toBe(photo.sha256);
    expect(Buffer.from(stored!.base64, "base64").byteLength).toBe(photo.byteSize);
    expect([stored!.width, stored!.height]).toEqual([photo.width, photo.height]);
    expect(Math.max(photo.width, photo.height)).toBeLessThanOrEqual(2048);
    expect(photo.contentType).toBe("image/jpeg");
    expect(photo.uploaded).toBe(0);
  }
  for (const p of photos) {
    test
      .info()
      .annotations.push({ type: "photo", description: `${p.width}×${p.height}, ${p.byteSize} bytes` });
  }
  const digPhoto = photos.find((p) => p.dugPlantId === null)!;
  const plantPhoto = photos.find((p) => p.dugPlantId === plants[0]!.id)!;
  expect(digPhoto.caption).toBe("Row 4, east end");
  expect(digPhoto.byteSize).toBeLessThan(statSync(LANDSCAPE).size);
  expect(plantPhoto.byteSize).toBeLessThan(statSync(PORTRAIT).size);
  // The 2400 px landscape shot came down to the 2048 px long edge (or under, if it had to shrink more).
  expect(digPhoto.width).toBeLessThanOrEqual(2048);
  expect(digPhoto.width / digPhoto.height).toBeCloseTo(2400 / 1300, 1);

  // One outbox entry per record, queued in the same save.
  const outbox = (await readStore<{ name: string; recordId: string }>(again, "outbox")).filter((e) =>
    [site!.id, ...plants.map((p) => p.id), ...photos.map((p) => p.id)].includes(e.recordId),
  );
  expect(outbox.map((e) => e.name).sort()).toEqual([
    "digSite.put",
    "dugPlant.put",
    "dugPlant.put",
    "dugPlant.put",
    "photo.put",
    "photo.put",
  ]);
  expect(new Set(outbox.map((e) => e.recordId)).size).toBe(6);
  expect((await readStore<{ key: string }>(again, "drafts")).map((d) => d.key)).not.toContain("dig:new");

  // The same dig opens for editing offline from the one stored edit page.
  await again.goto(`/field/digs/edit?id=${site!.id}`);
  await expect(again.getByRole("heading", { level: 1, name: "Edit dig" })).toBeVisible();
  await expect(again.getByRole("region", { name: "Plant 3", exact: true })).toBeVisible();
  await expect(again.getByRole("img", { name: "Photo 1 of the dig" })).toBeVisible();
  await expect(again.getByRole("img", { name: "Photo 1 of plant 1" })).toBeVisible();
  await expect(again.getByLabel("Recommendation for the grower")).toHaveValue(advice);
  await context.close();
});

test("a half-filled dig survives a reload offline, and discarding the draft starts over", async ({
  browser,
}) => {
  test.setTimeout(90_000);
  const { context, page, field } = await preparePhone(browser);
  await goOffline(context, page);
  await acknowledgeCautions(page);
  await chooseField(page, field);
  const p1 = page.getByRole("region", { name: "Plant 1", exact: true });
  await p1.getByLabel("Leaf stage").selectOption("V2");
  await p1.getByLabel("Seeding depth").fill("1 1/2");
  await addPhoto(page, "the dig", PORTRAIT, 1);
  await expect(page.getByText(/Draft kept on this phone/)).toBeVisible();
  // The draft holds the photo's bytes too before the tab goes.
  await expect
    .poll(async () => {
      const drafts = await readStore<{
        key: string;
        value: { photos: { bytes: { byteLength: number } | null }[] };
      }>(page, "drafts");
      const photos = drafts.find((d) => d.key === "dig:new")?.value.photos ?? [];
      return photos.filter((p) => (p.bytes?.byteLength ?? 0) > 0).length;
    })
    .toBe(1);

  await page.reload();
  await expect(page.getByText("Picked up where you left off")).toBeVisible();
  await expect(page.getByLabel("Field", { exact: true })).toHaveValue(field.id);
  await expect(p1.getByLabel("Leaf stage")).toHaveValue("V2");
  await expect(p1.getByLabel("Seeding depth")).toHaveValue("1 1/2");
  await expect(page.getByRole("img", { name: "Photo 1 of the dig" })).toBeVisible();

  await page.getByRole("button", { name: "Discard draft" }).click();
  const confirm = page.getByRole("dialog", { name: "Discard this draft?" });
  await confirm.getByRole("button", { name: "Discard draft" }).click();
  await expect(page.getByLabel("Field", { exact: true })).toHaveValue("");
  await expect(
    page.getByRole("region", { name: "Plant 1", exact: true }).getByLabel("Seeding depth"),
  ).toHaveValue("");
  await expect(page.getByRole("img", { name: "Photo 1 of the dig" })).toHaveCount(0);
  expect((await readStore<{ key: string }>(page, "drafts")).map((d) => d.key)).not.toContain("dig:new");
  await context.close();
});

test("a full phone on save is said plainly, nothing is saved, and the entries stay", async ({ browser }) => {
  test.setTimeout(90_000);
  const { context, page, field } = await preparePhone(browser);
  await goOffline(context, page);
  await acknowledgeCautions(page);
  await chooseField(page, field);
  await page.getByRole("radio", { name: "Not yet" }).check();
  const p1 = page.getByRole("region", { name: "Plant 1", exact: true });
  await p1.getByLabel("Leaf stage").selectOption("V3");
  await p1.getByLabel("Crown depth").fill("3/4");
  const digId = await page.locator('input[type="hidden"][name="id"]').inputValue();
  const outboxBefore = (await readStore(page, "outbox")).length;

  // IndexedDB refuses every write as a full disk does.
  await page.evaluate(() => {
    const full = () => {
      throw new DOMException("The quota has been exceeded.", "QuotaExceededError");
    };
    const proto = IDBObjectStore.prototype as unknown as Record<string, unknown>;
    (window as unknown as Record<string, unknown>).__idbWrites = { put: proto.put, add: proto.add };
    proto.put = full;
    proto.add = full;
  });
  await page.getByRole("button", { name: "Save dig" }).click();
  const alert = page.getByRole("alert").filter({ hasText: "Not saved: this phone is out of storage space" });
  await expect(alert).toBeVisible();
  await expect(alert).toContainText("Nothing was saved, and your entries are still here.");
  await expect(page.getByText("Saved on this phone")).toHaveCount(0);
  await expect(p1.getByLabel("Crown depth")).toHaveValue("3/4");

  await page.evaluate(() => {
    const saved = (window as unknown as Record<string, { put: unknown; add: unknown }>).__idbWrites!;
    const proto = IDBObjectStore.prototype as unknown as Record<string, unknown>;
    proto.put = saved.put;
    proto.add = saved.add;
  });
  expect((await readStore<{ id: string }>(page, "digSites")).map((s) => s.id)).not.toContain(digId);
  expect(await readStore(page, "outbox")).toHaveLength(outboxBefore);

  // With space again the same entries save.
  await page.getByRole("button", { name: "Save dig" }).click();
  await expect(page.getByRole("heading", { name: "Saved on this phone" })).toBeVisible();
  expect((await readStore<{ id: string }>(page, "digSites")).map((s) => s.id)).toContain(digId);
  await context.close();
});

test("the new-dig page has no serious or critical accessibility violations", async ({ browser }) => {
  test.setTimeout(90_000);
  const { context, page, field } = await preparePhone(browser);
  const serious = async () =>
    (await new AxeBuilder({ page }).analyze()).violations
      .filter((v) => v.impact === "serious" || v.impact === "critical")
      .map((v) => ({ id: v.id, nodes: v.nodes.map((n) => n.target.join(" ")) }));

  await expect(page.getByRole("dialog", { name: "Before you dig today" })).toBeVisible();
  expect(await serious()).toEqual([]);
  await acknowledgeCautions(page);
  await chooseField(page, field);
  await page.getByRole("button", { name: "Copy last plant" }).click();
  const p1 = page.getByRole("region", { name: "Plant 1", exact: true });
  await p1.getByLabel("Leaf stage").selectOption("V3");
  await p1.getByLabel("Crown depth").fill("9"); // out of range: an error at the field
  await page.getByRole("button", { name: "Save dig" }).click();
  await expect(p1.getByText("The crown depth must be from 0 to 4 in.")).toBeVisible();
  await expect(p1.getByLabel("Crown depth")).toHaveAttribute("aria-invalid", "true");
  expect(await serious()).toEqual([]);
  await context.close();
});
