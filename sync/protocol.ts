import { z } from "zod";

// The sync protocol shared by the phone and the server (shared/SYNC.md): record payloads, mutations,
// push and pull bodies, and the versions both sides check. Isomorphic: no server or browser imports.

// Bump PROTOCOL_VERSION when the shape of push/pull changes; SCHEMA_VERSION when a record payload
// changes. The server accepts the current and the previous SCHEMA_VERSION.
export const PROTOCOL_VERSION = 1;
export const SCHEMA_VERSION = 1;

export const LEAF_STAGES = [
  "VE",
  "V1",
  "V2",
  "V3",
  "V4",
  "V5",
  "V6",
  "V7",
  "V8",
  "V9",
  "V10",
  "V11",
  "V12",
] as const;
export const MESOCOTYL = ["healthy", "discolored", "damaged", "severed"] as const;
export const INJURY = ["none", "slight", "moderate", "severe"] as const;
export const SOIL_MOISTURE = ["dry", "moist", "wet", "saturated"] as const;
export const FINDINGS = [
  "band_burn",
  "insect_feeding",
  "disease_lesion",
  "sidewall_compaction",
  "cold_injury",
  "crusting",
  "uneven_emergence",
] as const;
export const PHOTO_TYPES = ["image/jpeg", "image/png", "image/webp"] as const;
// Photos are compressed on the phone to about 2048 px on the long edge; anything bigger is refused.
export const MAX_PHOTO_BYTES = 8 * 1024 * 1024;

const id = z.guid({ error: "Not a valid record id." });
const isoDateTime = z.iso.datetime({ offset: true, error: "Use an ISO date and time." });
const text = (max: number) =>
  z
    .string()
    .trim()
    .max(max, { error: `Keep it to ${max} characters.` });
const num = (what: string, min: number, max: number, unit: string) =>
  z
    .number({ error: `Enter the ${what} as a number.` })
    .min(min, { error: `The ${what} must be from ${min} to ${max} ${unit}.` })
    .max(max, { error: `The ${what} must be from ${min} to ${max} ${unit}.` });
const whole = (what: string, min: number, max: number) =>
  z
    .number({ error: `Enter the ${what} as a whole number.` })
    .int({ error: `Enter the ${what} as a whole number.` })
    .min(min, { error: `The ${what} must be from ${min} to ${max}.` })
    .max(max, { error: `The ${what} must be from ${min} to ${max}.` });

// A dig site as the rep records it. The server adds rootIndex and the assessment itself.
export const digSiteSchema = z.strictObject({
  id,
  fieldId: id,
  plantingId: id.nullable(),
  dugAt: isoDateTime,
  latitude: num("latitude", -90, 90, "°").nullable(),
  longitude: num("longitude", -180, 180, "°").nullable(),
  accuracyM: num("location accuracy", 0, 10_000, "m").nullable(),
  soilMoisture: z.enum(SOIL_MOISTURE, { error: "Choose dry, moist, wet or saturated." }).nullable(),
  soilTempF: num("soil temperature", 20, 120, "°F").nullable(),
  irrigatedYet: z.boolean(),
  recommendation: text(4000).nullable(),
  flaggedByRep: z.boolean(),
  notes: text(4000).nullable(),
});

export const dugPlantSchema = z.strictObject({
  id,
  digSiteId: id,
  position: whole("plant number", 1, 50),
  leafStage: z.enum(LEAF_STAGES, { error: "Choose a leaf stage from VE to V12." }),
  seedingDepthIn: num("seeding depth", 0, 5, "in").nullable(),
  crownDepthIn: num("crown depth", 0, 4, "in").nullable(),
  mesocotyl: z.enum(MESOCOTYL, { error: "Choose healthy, discolored, damaged or severed." }).nullable(),
  seminalScore: whole("seminal root score", 0, 5).nullable(),
  nodalWhorls: whole("nodal whorl count", 0, 12).nullable(),
  nodalCount: whole("nodal root count", 0, 80).nullable(),
  longestNodalIn: num("longest nodal root", 0, 36, "in").nullable(),
  seminalInjury: z.enum(INJURY),
  nodalInjury: z.enum(INJURY),
  findings: z.array(z.enum(FINDINGS)).max(FINDINGS.length),
  bandBesideIn: num("band distance beside the seed", 0, 30, "in").nullable(),
  bandBelowIn: num("band distance below the seed", -4, 12, "in").nullable(),
  notes: text(2000).nullable(),
});

// Photo metadata; the bytes travel separately to the bucket, keyed by their SHA-256.
export const photoSchema = z.strictObject({
  id,
  digSiteId: id,
  dugPlantId: id.nullable(),
  sha256: z.string().regex(/^[0-9a-f]{64}$/, { error: "Not a SHA-256 hex digest." }),
  byteSize: whole("photo size", 1, MAX_PHOTO_BYTES),
  contentType: z.enum(PHOTO_TYPES, { error: "Photos must be JPEG, PNG or WebP." }),
  width: whole("photo width", 1, 20_000).nullable(),
  height: whole("photo height", 1, 20_000).nullable(),
  caption: text(500).nullable(),
  capturedAt: isoDateTime.nullable(),
});

export type DigSitePayload = z.infer<typeof digSiteSchema>;
export type DugPlantPayload = z.infer<typeof dugPlantSchema>;
export type PhotoPayload = z.infer<typeof photoSchema>;

// Mutations: a put is a create-or-update of a whole record; a delete leaves a tombstone.
export const mutationSchema = z.discriminatedUnion("name", [
  z.strictObject({ name: z.literal("digSite.put"), args: digSiteSchema }),
  z.strictObject({ name: z.literal("dugPlant.put"), args: dugPlantSchema }),
  z.strictObject({ name: z.literal("photo.put"), args: photoSchema }),
  z.strictObject({ name: z.literal("digSite.delete"), args: z.strictObject({ id }) }),
  z.strictObject({ name: z.literal("dugPlant.delete"), args: z.strictObject({ id }) }),
  z.strictObject({ name: z.literal("photo.delete"), args: z.strictObject({ id }) }),
]);
export type Mutation = z.infer<typeof mutationSchema>;
export type MutationName = Mutation["name"];

// One entry of the device's outbox, as pushed.
export const pushedMutationSchema = z.object({
  mutationId: z.number().int().positive(),
  // The server version the device last saw of the record (null for a new record).
  baseVersion: z.number().int().nonnegative().nullable(),
  // Device clock at the time of the edit: kept as observed-at data, never used for ordering.
  observedAt: isoDateTime,
  mutation: mutationSchema,
});

export const pushRequestSchema = z.strictObject({
  protocolVersion: z.number().int(),
  schemaVersion: z.number().int(),
  clientGroupId: id,
  clientId: id,
  mutations: z.array(pushedMutationSchema).max(500),
});
export type PushRequest = z.infer<typeof pushRequestSchema>;

// The answer to a push (sync/server/push.ts has the whole contract). lastMutationId is the highest id
// the server has applied or refused for this client: the device drops outbox entries up to it. Each
// mutation of the request has a result; `duplicate` marks one an earlier push already settled.
// `heldAt`: a photo.put whose object is not confirmed in the bucket yet stops the push there (nothing
// from it on is applied, lastMutationId stays before it); the device uploads and confirms the photo,
// then pushes again.
export const pushResultSchema = z.object({
  mutationId: z.number().int().positive(),
  status: z.enum(["applied", "rejected"]),
  reason: z.string().optional(),
  duplicate: z.boolean().optional(),
});
export const pushResponseSchema = z.object({
  protocolVersion: z.number().int(),
  lastMutationId: z.number().int().nonnegative(),
  results: z.array(pushResultSchema),
  heldAt: z.number().int().positive().optional(),
  reason: z.string().optional(),
});
export type PushResult = z.infer<typeof pushResultSchema>;
export type PushResponse = z.infer<typeof pushResponseSchema>;

export const pullRequestSchema = z.strictObject({
  protocolVersion: z.number().int(),
  schemaVersion: z.number().int(),
  clientGroupId: id,
  // The opaque server cursor from the last applied pull (it encodes the server-assigned version of
  // each region the user sees), or null for a first pull.
  cursor: z.string().max(4000).nullable(),
});
export type PullRequest = z.infer<typeof pullRequestSchema>;

const version = z.number().int().nonnegative();
const tombstone = { version, deleted: z.boolean() };

// Reference data the field app needs offline, as the server sends it.
export const pulledAccountSchema = z.object({
  id,
  name: z.string(),
  locality: z.string().nullable(),
  regionId: id,
});
export const pulledFieldSchema = z.object({
  id,
  accountId: id,
  name: z.string(),
  boundary: z.unknown().nullable(),
  areaAcres: z.number().nullable(),
  centroidLat: z.number().nullable(),
  centroidLon: z.number().nullable(),
  irrigation: z.string(),
  soilTexture: z.enum(["coarse", "medium", "fine"]),
  weatherStationId: id.nullable(),
  firstIrrigationOn: z.iso.date().nullable(),
  ...tombstone,
});
export const pulledPlantingSchema = z.object({
  id,
  fieldId: id,
  accountId: id,
  hybrid: z.string(),
  plantedOn: z.iso.date(),
  seedingRate: z.number(),
  seedingDepthIn: z.number(),
  rowSpacingIn: z.number(),
  soilTexture: z.enum(["coarse", "medium", "fine"]),
  ...tombstone,
});
export const pulledFertilizerPassSchema = z.object({
  id,
  fieldId: id,
  plantingId: id.nullable(),
  productId: id,
  appliedOn: z.iso.date(),
  rate: z.number(),
  rateUnit: z.enum(["lb/ac", "gal/ac"]),
  placement: z.enum(["seed_placed", "band_2x2", "side_dress", "broadcast"]),
  intendedBesideIn: z.number().nullable(),
  intendedBelowIn: z.number().nullable(),
  ...tombstone,
});
export const pulledProductSchema = z.object({
  id,
  name: z.string(),
  chemistry: z.string(),
  form: z.enum(["liquid", "dry", "gas"]),
  n: z.number(),
  p2o5: z.number(),
  k2o: z.number(),
  s: z.number(),
  lbPerGal: z.number().nullable(),
  densitySource: z.string().nullable(),
  saltIndex: z.number().nullable(),
  saltIndexSource: z.string().nullable(),
  containsUrea: z.boolean(),
  containsThiosulfate: z.boolean(),
});
export const pulledWeatherDaySchema = z.object({
  stationId: id,
  day: z.iso.date(),
  maxF: z.number(),
  minF: z.number(),
});
export const pulledDigSiteSchema = digSiteSchema.extend({
  accountId: id,
  repId: id.nullable(),
  rootIndex: z.number().nullable(),
  assessment: z.unknown().nullable(),
  ...tombstone,
});
export const pulledDugPlantSchema = dugPlantSchema.extend({ rootIndex: z.number().nullable(), ...tombstone });
export const pulledPhotoSchema = photoSchema.extend({ confirmedAt: isoDateTime.nullable(), ...tombstone });

export const pullResponseSchema = z.object({
  protocolVersion: z.number().int(),
  cursor: z.string(),
  // True when the device must drop its copy of server data (cursor too old or from another user);
  // its outbox is kept.
  reset: z.boolean(),
  // Highest mutation id the server has applied or refused, per client of this client group.
  lastMutationIds: z.record(z.string(), z.number().int().nonnegative()),
  // Mutations the server refused for good, with the reason to show the rep.
  rejections: z.array(
    z.object({ clientId: id, mutationId: z.number().int(), name: z.string(), reason: z.string() }),
  ),
  changes: z.object({
    accounts: z.array(pulledAccountSchema),
    fields: z.array(pulledFieldSchema),
    plantings: z.array(pulledPlantingSchema),
    fertilizerPasses: z.array(pulledFertilizerPassSchema),
    products: z.array(pulledProductSchema),
    weather: z.array(pulledWeatherDaySchema),
    digSites: z.array(pulledDigSiteSchema),
    dugPlants: z.array(pulledDugPlantSchema),
    photos: z.array(pulledPhotoSchema),
  }),
});
export type PullResponse = z.infer<typeof pullResponseSchema>;
export type PulledField = z.infer<typeof pulledFieldSchema>;
export type PulledPlanting = z.infer<typeof pulledPlantingSchema>;
export type PulledFertilizerPass = z.infer<typeof pulledFertilizerPassSchema>;
export type PulledProduct = z.infer<typeof pulledProductSchema>;
export type PulledAccount = z.infer<typeof pulledAccountSchema>;
export type PulledWeatherDay = z.infer<typeof pulledWeatherDaySchema>;
