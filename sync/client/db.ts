import Dexie, { type EntityTable } from "dexie";
import type {
  DigSitePayload,
  DugPlantPayload,
  MutationName,
  PhotoPayload,
  PulledAccount,
  PulledFertilizerPass,
  PulledField,
  PulledPlanting,
  PulledProduct,
  PulledWeatherDay,
} from "../protocol";

// The one IndexedDB database of the field app. Reference data arrives by pull; every record the rep
// makes is written here first, with its outbox entry in the same transaction.

// local: saved on this device only (not yet queued — drafts); waiting: queued for sync; synced: the
// server has it; conflict: the server kept another value for a field; rejected: the server refused it.
export type SyncState = "waiting" | "synced" | "conflict" | "rejected";

interface LocalSyncColumns {
  syncState: SyncState;
  // The server version this device last saw (null until the first pull that includes it).
  serverVersion: number | null;
  // Why the server refused the last change, shown to the rep.
  rejectionReason: string | null;
  updatedLocallyAt: string;
}

export type LocalDigSite = DigSitePayload &
  LocalSyncColumns & {
    accountId: string;
    rootIndex: number | null;
    assessment: unknown;
  };
export type LocalDugPlant = DugPlantPayload & LocalSyncColumns & { rootIndex: number | null };
// IndexedDB cannot index booleans: uploaded is 0/1.
export type LocalPhoto = PhotoPayload & LocalSyncColumns & { uploaded: 0 | 1; confirmedAt: string | null };
export interface LocalPhotoBytes {
  id: string;
  bytes: ArrayBuffer;
}

export type LocalField = Omit<PulledField, "deleted" | "version"> & { version: number };
export type LocalPlanting = Omit<PulledPlanting, "deleted" | "version"> & { version: number };
export type LocalFertilizerPass = Omit<PulledFertilizerPass, "deleted" | "version"> & { version: number };

export interface OutboxEntry {
  // Per-client counter, the mutation id pushed to the server.
  mutationId: number;
  name: MutationName;
  args: unknown;
  recordId: string;
  baseVersion: number | null;
  observedAt: string;
  schemaVersion: number;
}

export interface MetaRow {
  key: string;
  value: unknown;
}

export interface DraftRow {
  key: string;
  value: unknown;
  updatedAt: string;
}

export class FieldDatabase extends Dexie {
  accounts!: EntityTable<PulledAccount, "id">;
  fields!: EntityTable<LocalField, "id">;
  plantings!: EntityTable<LocalPlanting, "id">;
  fertilizerPasses!: EntityTable<LocalFertilizerPass, "id">;
  products!: EntityTable<PulledProduct, "id">;
  weather!: Dexie.Table<PulledWeatherDay, [string, string]>;
  digSites!: EntityTable<LocalDigSite, "id">;
  dugPlants!: EntityTable<LocalDugPlant, "id">;
  photos!: EntityTable<LocalPhoto, "id">;
  photoBytes!: EntityTable<LocalPhotoBytes, "id">;
  outbox!: EntityTable<OutboxEntry, "mutationId">;
  meta!: EntityTable<MetaRow, "key">;
  drafts!: EntityTable<DraftRow, "key">;

  constructor(name = "trenchbook") {
    super(name);
    this.version(1).stores({
      accounts: "id",
      fields: "id, accountId",
      plantings: "id, fieldId",
      fertilizerPasses: "id, fieldId, plantingId",
      products: "id, name",
      weather: "[stationId+day], stationId",
      digSites: "id, fieldId, syncState, dugAt",
      dugPlants: "id, digSiteId, syncState",
      photos: "id, digSiteId, dugPlantId, sha256, uploaded, syncState",
      photoBytes: "id",
      outbox: "mutationId, recordId",
      meta: "key",
      drafts: "key",
    });
  }
}

let instance: FieldDatabase | null = null;

// The app's database, opened on first use and reopened after the browser closed it (a backgrounded
// phone may drop the connection).
export function fieldDb(): FieldDatabase {
  if (!instance) instance = new FieldDatabase();
  if (!instance.isOpen() && instance.hasBeenClosed()) instance = new FieldDatabase();
  return instance;
}

// For tests: a database with its own name.
export function openFieldDb(name: string): FieldDatabase {
  return new FieldDatabase(name);
}
