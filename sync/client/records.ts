import {
  type DigSitePayload,
  type DugPlantPayload,
  digSiteSchema,
  dugPlantSchema,
  type MutationName,
  type PhotoPayload,
  photoSchema,
  SCHEMA_VERSION,
} from "../protocol";
import type { FieldDatabase, LocalDigSite, LocalDugPlant, LocalPhoto, OutboxEntry } from "./db";

// The field app's write path: every save puts the records and their outbox entries in ONE Dexie
// transaction, so "Saved" means both are on the device. Nothing here touches the network.

export interface NewPhoto {
  meta: PhotoPayload;
  bytes: ArrayBuffer;
}

export interface DigSave {
  site: DigSitePayload & { accountId: string };
  plants: DugPlantPayload[];
  // Photos taken since the last save (their bytes are stored with them).
  newPhotos: NewPhoto[];
  // Photo captions edited on photos already saved.
  photoCaptions?: Record<string, string | null>;
  removedPlantIds: string[];
  removedPhotoIds: string[];
  // The draft this save completes, removed in the same transaction.
  draftKey?: string;
}

const NEXT_MUTATION_ID = "nextMutationId";

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

function pick<T extends object>(row: T, keys: readonly string[]): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const k of keys) out[k] = (row as Record<string, unknown>)[k];
  return out;
}

const SITE_KEYS = Object.keys(digSiteSchema.shape);
const PLANT_KEYS = Object.keys(dugPlantSchema.shape);
const PHOTO_KEYS = Object.keys(photoSchema.shape);

/**
 * Saves a whole dig (site, plants, new photos, removals) and queues one outbox entry per changed
 * record, all in one transaction. Idempotent for unchanged records (nothing is queued twice).
 * Throws a ZodError for invalid payloads (forms validate first) and the storage error when the
 * device is out of space; in both cases nothing is written.
 */
export async function saveDig(db: FieldDatabase, save: DigSave, now = new Date()): Promise<void> {
  const site = digSiteSchema.parse(pick(save.site, SITE_KEYS));
  const plants = save.plants.map((p) => dugPlantSchema.parse(pick(p, PLANT_KEYS)));
  const photos = save.newPhotos.map((p) => ({
    meta: photoSchema.parse(pick(p.meta, PHOTO_KEYS)),
    bytes: p.bytes,
  }));
  const observedAt = now.toISOString();

  await db.transaction(
    "rw",
    [db.digSites, db.dugPlants, db.photos, db.photoBytes, db.outbox, db.meta, db.drafts],
    async () => {
      let next = ((await db.meta.get(NEXT_MUTATION_ID))?.value as number | undefined) ?? 1;
      const queue = async (
        name: MutationName,
        args: unknown,
        recordId: string,
        baseVersion: number | null,
      ) => {
        const entry: OutboxEntry = {
          mutationId: next++,
          name,
          args,
          recordId,
          baseVersion,
          observedAt,
          schemaVersion: SCHEMA_VERSION,
        };
        await db.outbox.add(entry);
      };
      const local = { syncState: "waiting" as const, rejectionReason: null, updatedLocallyAt: observedAt };

      const oldSite = await db.digSites.get(site.id);
      if (!oldSite || !same(pick(oldSite, SITE_KEYS), site)) {
        const row: LocalDigSite = {
          ...site,
          ...local,
          accountId: save.site.accountId,
          serverVersion: oldSite?.serverVersion ?? null,
          rootIndex: oldSite?.rootIndex ?? null,
          assessment: oldSite?.assessment ?? null,
        };
        await db.digSites.put(row);
        await queue("digSite.put", site, site.id, oldSite?.serverVersion ?? null);
      }

      for (const plant of plants) {
        const old = await db.dugPlants.get(plant.id);
        if (old && same(pick(old, PLANT_KEYS), plant)) continue;
        const row: LocalDugPlant = {
          ...plant,
          ...local,
          serverVersion: old?.serverVersion ?? null,
          rootIndex: null,
        };
        await db.dugPlants.put(row);
        await queue("dugPlant.put", plant, plant.id, old?.serverVersion ?? null);
      }
      for (const plantId of save.removedPlantIds) {
        const old = await db.dugPlants.get(plantId);
        if (!old) continue;
        await db.dugPlants.delete(plantId);
        await queue("dugPlant.delete", { id: plantId }, plantId, old.serverVersion);
      }

      for (const photo of photos) {
        const row: LocalPhoto = {
          ...photo.meta,
          ...local,
          serverVersion: null,
          uploaded: 0,
          confirmedAt: null,
        };
        await db.photos.put(row);
        await db.photoBytes.put({ id: photo.meta.id, bytes: photo.bytes });
        await queue("photo.put", photo.meta, photo.meta.id, null);
      }
      for (const [photoId, caption] of Object.entries(save.photoCaptions ?? {})) {
        const old = await db.photos.get(photoId);
        if (!old || old.caption === caption) continue;
        const meta = photoSchema.parse({ ...pick(old, PHOTO_KEYS), caption });
        await db.photos.put({ ...old, ...meta, ...local });
        await queue("photo.put", meta, photoId, old.serverVersion);
      }
      for (const photoId of save.removedPhotoIds) {
        const old = await db.photos.get(photoId);
        if (!old) continue;
        // A photo the server has confirmed is evidence: it is removed on the server, never silently.
        await db.photos.delete(photoId);
        await db.photoBytes.delete(photoId);
        await queue("photo.delete", { id: photoId }, photoId, old.serverVersion);
      }

      await db.meta.put({ key: NEXT_MUTATION_ID, value: next });
      if (save.draftKey) await db.drafts.delete(save.draftKey);
    },
  );
}

export interface LocalDigSummary {
  site: LocalDigSite;
  plantCount: number;
  photoCount: number;
  fieldName: string | null;
  // The worst state among the site and its children: what the rep needs to know about this dig.
  state: LocalDigSite["syncState"];
}

const STATE_RANK = { synced: 0, waiting: 1, conflict: 2, rejected: 3 } as const;

export async function listLocalDigs(db: FieldDatabase): Promise<LocalDigSummary[]> {
  return db.transaction("r", [db.digSites, db.dugPlants, db.photos, db.fields], async () => {
    const sites = await db.digSites.orderBy("dugAt").reverse().toArray();
    return Promise.all(
      sites
        .filter((s) => !(s as { deleted?: boolean }).deleted)
        .map(async (site) => {
          const plants = await db.dugPlants.where("digSiteId").equals(site.id).toArray();
          const photos = await db.photos.where("digSiteId").equals(site.id).toArray();
          const field = await db.fields.get(site.fieldId);
          const state = [site, ...plants, ...photos]
            .map((r) => r.syncState)
            .reduce((a, b) => (STATE_RANK[b] > STATE_RANK[a] ? b : a), "synced" as LocalDigSite["syncState"]);
          return {
            site,
            plantCount: plants.length,
            photoCount: photos.length,
            fieldName: field?.name ?? null,
            state,
          };
        }),
    );
  });
}

export async function loadLocalDig(db: FieldDatabase, id: string) {
  return db.transaction("r", [db.digSites, db.dugPlants, db.photos], async () => {
    const site = await db.digSites.get(id);
    if (!site) return null;
    const plants = await db.dugPlants.where("digSiteId").equals(id).sortBy("position");
    const photos = await db.photos.where("digSiteId").equals(id).toArray();
    return { site, plants, photos };
  });
}

export async function pendingCounts(db: FieldDatabase): Promise<{ mutations: number; photos: number }> {
  return db.transaction("r", [db.outbox, db.photos], async () => ({
    mutations: await db.outbox.count(),
    photos: await db.photos.where("uploaded").equals(0).count(),
  }));
}

// Drafts keep a half-filled form across a reload or a closed tab.
export async function saveDraft(db: FieldDatabase, key: string, value: unknown, now = new Date()) {
  await db.drafts.put({ key, value, updatedAt: now.toISOString() });
}

export async function loadDraft<T>(db: FieldDatabase, key: string): Promise<T | null> {
  return ((await db.drafts.get(key))?.value as T | undefined) ?? null;
}

export async function clearDraft(db: FieldDatabase, key: string) {
  await db.drafts.delete(key);
}
