import type { ColumnType, Generated, Insertable, Selectable, Updateable } from "kysely";

// PostgreSQL's bigint and date come back as strings through pg unless parsed; db/client.ts parses
// bigint (int8) to number (sync versions stay far below 2^53) and keeps dates as 'YYYY-MM-DD'.
type Timestamp = ColumnType<Date, Date | string, Date | string>;
type Json = ColumnType<unknown, string, string>;
// Column types with a database default (kysely's Generated<> must not wrap a ColumnType).
type GeneratedTimestamp = ColumnType<Date, Date | string | undefined, Date | string>;
type GeneratedJson = ColumnType<unknown, string | undefined, string>;

export type Role = "rep" | "grower" | "supervisor" | "admin";
export type UserStatus = "invited" | "active" | "deactivated";
export type SoilTexture = "coarse" | "medium" | "fine";
export type Placement = "seed_placed" | "band_2x2" | "side_dress" | "broadcast";
export type InjuryScore = "none" | "slight" | "moderate" | "severe";
export type CaseStatus = "new" | "in_review" | "decided" | "closed";

interface SyncColumns {
  version: Generated<number>;
  fieldVersions: GeneratedJson;
  createdBy: string | null;
  updatedBy: string | null;
  createdAt: GeneratedTimestamp;
  updatedAt: GeneratedTimestamp;
  deletedAt: Timestamp | null;
}

export interface RegionTable {
  id: Generated<string>;
  name: string;
  createdAt: GeneratedTimestamp;
}

export interface AppUserTable {
  id: Generated<string>;
  email: string;
  name: string;
  role: Role;
  regionId: string | null;
  passwordHash: string | null;
  status: Generated<UserStatus>;
  units: Generated<"us" | "metric">;
  createdAt: GeneratedTimestamp;
  updatedAt: GeneratedTimestamp;
}

export interface OneTimeTokenTable {
  id: Generated<string>;
  userId: string;
  purpose: "invite" | "password_reset";
  tokenHash: string;
  expiresAt: Timestamp;
  usedAt: Timestamp | null;
  createdBy: string | null;
  createdAt: GeneratedTimestamp;
}

export interface SignInAttemptTable {
  id: Generated<string>;
  email: string;
  succeeded: boolean;
  attemptedAt: GeneratedTimestamp;
}

export interface AccountTable {
  id: Generated<string>;
  regionId: string;
  name: string;
  locality: string | null;
  createdAt: GeneratedTimestamp;
  updatedAt: GeneratedTimestamp;
}

export interface AccountMemberTable {
  accountId: string;
  userId: string;
  createdAt: GeneratedTimestamp;
}

export interface SyncCursorTable {
  regionId: string;
  version: Generated<number>;
}

export interface WeatherStationTable {
  id: Generated<string>;
  regionId: string;
  name: string;
  latitude: number;
  longitude: number;
  createdAt: GeneratedTimestamp;
}

export interface WeatherDailyTable {
  stationId: string;
  day: string;
  maxF: number;
  minF: number;
  source: Generated<string>;
  version: Generated<number>;
}

export interface FieldTable extends SyncColumns {
  id: Generated<string>;
  accountId: string;
  name: string;
  boundary: Json | null;
  areaAcres: number | null;
  centroidLat: number | null;
  centroidLon: number | null;
  irrigation: Generated<"furrow" | "sprinkler" | "drip" | "none">;
  soilTexture: Generated<SoilTexture>;
  weatherStationId: string | null;
  firstIrrigationOn: string | null;
}

export interface ProductTable {
  id: Generated<string>;
  name: string;
  chemistry: string;
  form: "liquid" | "dry" | "gas";
  gradeN: number;
  gradeP2o5: number;
  gradeK2o: number;
  gradeS: Generated<number>;
  lbPerGal: number | null;
  densitySource: string | null;
  saltIndex: number | null;
  saltIndexSource: string | null;
  containsUrea: Generated<boolean>;
  containsThiosulfate: Generated<boolean>;
  active: Generated<boolean>;
  version: Generated<number>;
  createdAt: GeneratedTimestamp;
  updatedAt: GeneratedTimestamp;
}

export interface PlantingTable extends SyncColumns {
  id: string;
  fieldId: string;
  accountId: string;
  hybrid: string;
  plantedOn: string;
  seedingRate: number;
  seedingDepthIn: number;
  rowSpacingIn: number;
  soilTexture: SoilTexture;
  notes: string | null;
}

export interface FertilizerPassTable extends SyncColumns {
  id: string;
  fieldId: string;
  plantingId: string | null;
  accountId: string;
  productId: string;
  appliedOn: string;
  rate: number;
  rateUnit: "lb/ac" | "gal/ac";
  placement: Placement;
  intendedBesideIn: number | null;
  intendedBelowIn: number | null;
  notes: string | null;
}

export interface DigSiteTable extends SyncColumns {
  id: string;
  fieldId: string;
  plantingId: string | null;
  accountId: string;
  repId: string | null;
  dugAt: Timestamp;
  latitude: number | null;
  longitude: number | null;
  accuracyM: number | null;
  soilMoisture: "dry" | "moist" | "wet" | "saturated" | null;
  soilTempF: number | null;
  irrigatedYet: Generated<boolean>;
  recommendation: string | null;
  flaggedByRep: Generated<boolean>;
  notes: string | null;
  rootIndex: number | null;
  assessment: Json | null;
  // Recent changes of each device-edited field (sync/server/merge.ts).
  fieldChanges: GeneratedJson;
}

export interface DugPlantTable extends SyncColumns {
  id: string;
  digSiteId: string;
  position: Generated<number>;
  leafStage: string;
  seedingDepthIn: number | null;
  crownDepthIn: number | null;
  mesocotyl: "healthy" | "discolored" | "damaged" | "severed" | null;
  seminalScore: number | null;
  nodalWhorls: number | null;
  nodalCount: number | null;
  longestNodalIn: number | null;
  seminalInjury: Generated<InjuryScore>;
  nodalInjury: Generated<InjuryScore>;
  findings: Generated<string[]>;
  bandBesideIn: number | null;
  bandBelowIn: number | null;
  notes: string | null;
  rootIndex: number | null;
  fieldChanges: GeneratedJson;
}

export interface PhotoTable extends SyncColumns {
  id: string;
  digSiteId: string;
  dugPlantId: string | null;
  sha256: string;
  byteSize: number;
  contentType: string;
  width: number | null;
  height: number | null;
  caption: string | null;
  capturedAt: Timestamp | null;
  objectKey: string;
  confirmedAt: Timestamp | null;
  isIllustration: Generated<boolean>;
  fieldChanges: GeneratedJson;
}

// A photo object verified in the bucket (size and SHA-256), keyed by its hash.
export interface PhotoObjectTable {
  sha256: string;
  byteSize: number;
  confirmedAt: GeneratedTimestamp;
}

export interface InjuryCaseTable extends SyncColumns {
  id: Generated<string>;
  digSiteId: string;
  accountId: string;
  status: Generated<CaseStatus>;
  severity: "caution" | "warning" | "critical";
  decision: "injury_confirmed" | "not_injury" | "inconclusive" | null;
  decisionReason: string | null;
  assignedTo: string | null;
  sharedWithGrower: Generated<boolean>;
  decidedAt: Timestamp | null;
}

export interface InjuryCaseEventTable {
  id: Generated<string>;
  caseId: string;
  actorId: string | null;
  kind: "opened" | "status" | "assigned" | "comment" | "decision" | "shared" | "reopened";
  body: string | null;
  payload: GeneratedJson;
  createdAt: GeneratedTimestamp;
}

export interface SyncClientGroupTable {
  id: string;
  userId: string;
  createdAt: GeneratedTimestamp;
}

export interface SyncClientTable {
  id: string;
  clientGroupId: string;
  lastMutationId: Generated<number>;
  lastSeenAt: GeneratedTimestamp;
}

export interface SyncMutationResultTable {
  clientId: string;
  mutationId: number;
  name: string;
  status: "applied" | "rejected";
  reason: string | null;
  createdAt: GeneratedTimestamp;
}

export interface SyncConflictTable {
  id: Generated<string>;
  regionId: string;
  tableName: string;
  recordId: string;
  fieldName: string;
  baseVersion: number;
  serverValue: Json | null;
  clientValue: Json | null;
  serverUserId: string | null;
  clientUserId: string | null;
  serverChangedAt: Timestamp | null;
  clientReceivedAt: GeneratedTimestamp;
  clientObservedAt: Timestamp | null;
  settledBy: string | null;
  settledAt: Timestamp | null;
  settledValue: Json | null;
  version: Generated<number>;
}

export interface RecommendationResponseTable {
  id: Generated<string>;
  digSiteId: string;
  userId: string;
  kind: "acknowledged" | "comment";
  body: string | null;
  createdAt: GeneratedTimestamp;
}

export type FieldReportStatus = "sending" | "sent" | "failed";

export interface FieldReportTable {
  id: Generated<string>;
  fieldId: string;
  accountId: string;
  createdBy: string | null;
  objectKey: string;
  byteSize: number;
  sha256: string;
  recipients: ColumnType<string[], string[] | undefined, string[]>;
  status: ColumnType<FieldReportStatus, FieldReportStatus | undefined, FieldReportStatus>;
  error: string | null;
  createdAt: GeneratedTimestamp;
  sentAt: Timestamp | null;
}

export interface Database {
  region: RegionTable;
  appUser: AppUserTable;
  oneTimeToken: OneTimeTokenTable;
  signInAttempt: SignInAttemptTable;
  account: AccountTable;
  accountRep: AccountMemberTable;
  accountGrower: AccountMemberTable;
  syncCursor: SyncCursorTable;
  weatherStation: WeatherStationTable;
  weatherDaily: WeatherDailyTable;
  field: FieldTable;
  product: ProductTable;
  planting: PlantingTable;
  fertilizerPass: FertilizerPassTable;
  digSite: DigSiteTable;
  dugPlant: DugPlantTable;
  photo: PhotoTable;
  photoObject: PhotoObjectTable;
  injuryCase: InjuryCaseTable;
  injuryCaseEvent: InjuryCaseEventTable;
  syncClientGroup: SyncClientGroupTable;
  syncClient: SyncClientTable;
  syncMutationResult: SyncMutationResultTable;
  syncConflict: SyncConflictTable;
  fieldReport: FieldReportTable;
  recommendationResponse: RecommendationResponseTable;
}

export type Region = Selectable<RegionTable>;
export type AppUser = Selectable<AppUserTable>;
export type NewAppUser = Insertable<AppUserTable>;
export type AppUserUpdate = Updateable<AppUserTable>;
export type Account = Selectable<AccountTable>;
export type NewAccount = Insertable<AccountTable>;
export type Field = Selectable<FieldTable>;
export type NewField = Insertable<FieldTable>;
export type FieldUpdate = Updateable<FieldTable>;
export type Product = Selectable<ProductTable>;
export type NewProduct = Insertable<ProductTable>;
export type Planting = Selectable<PlantingTable>;
export type NewPlanting = Insertable<PlantingTable>;
export type PlantingUpdate = Updateable<PlantingTable>;
export type FertilizerPass = Selectable<FertilizerPassTable>;
export type NewFertilizerPass = Insertable<FertilizerPassTable>;
export type FertilizerPassUpdate = Updateable<FertilizerPassTable>;
export type DigSite = Selectable<DigSiteTable>;
export type NewDigSite = Insertable<DigSiteTable>;
export type DugPlant = Selectable<DugPlantTable>;
export type NewDugPlant = Insertable<DugPlantTable>;
export type Photo = Selectable<PhotoTable>;
export type NewPhoto = Insertable<PhotoTable>;
export type PhotoObject = Selectable<PhotoObjectTable>;
export type SyncConflict = Selectable<SyncConflictTable>;
export type InjuryCase = Selectable<InjuryCaseTable>;
export type InjuryCaseEvent = Selectable<InjuryCaseEventTable>;
export type WeatherDaily = Selectable<WeatherDailyTable>;
export type RecommendationResponse = Selectable<RecommendationResponseTable>;
export type FieldReport = Selectable<FieldReportTable>;
