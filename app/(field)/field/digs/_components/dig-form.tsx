"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useLiveQuery } from "dexie-react-hooks";
import { useFormatter, useTranslations } from "next-intl";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { FormProvider, type Resolver, useFieldArray, useForm, useWatch } from "react-hook-form";
import { metersToFeet } from "@/lib/agronomy";
import {
  copyPlant,
  type DigFormOutput,
  type DigFormValues,
  digFormSchema,
  emptyPlant,
} from "@/lib/digs/form-schema";
import { nearestField } from "@/lib/digs/nearest-field";
import { fieldDb, type SyncState } from "@/sync/client/db";
import { pullNow } from "@/sync/client/pull";
import { saveDig, saveDraft } from "@/sync/client/records";
import { classifyStorageError, type StorageErrorKind } from "@/sync/client/storage";
import { SOIL_MOISTURE } from "@/sync/protocol";
import { requestSync } from "../../_components/sync-status-bar";
import { ConfirmDialog } from "./confirm-dialog";
import { type DigPhoto, photoCaption, photoPayload } from "./dig-photos";
import { RadioChoices, SelectInput, TextArea, TextInput } from "./form-controls";
import { LiveSummary } from "./live-summary";
import { PhotoStrip } from "./photo-strip";
import { PlantCard } from "./plant-card";
import { usePosition } from "./use-position";

/** What the draft keeps: the whole form, the photos with their bytes, and what was removed. */
export interface DigDraft {
  values: DigFormValues;
  photos: DigPhoto[];
  removedPlantIds: string[];
  removedPhotoIds: string[];
}

export interface DigFormInitial extends DigDraft {
  mode: "new" | "edit";
  draftKey: string;
  /** When a draft was restored, its time. */
  restoredAt: string | null;
  /** Sync state of each record already saved on this phone (site, plants, photos), by id. */
  savedStates: Record<string, SyncState>;
  readOnly: boolean;
}

type SaveState =
  | { kind: "idle" }
  | { kind: "saving" }
  | { kind: "invalid" }
  | { kind: "failed"; storage: StorageErrorKind; message: string };

type DraftState =
  | { kind: "none" }
  | { kind: "kept"; at: Date }
  | { kind: "failed"; storage: StorageErrorKind };

const DRAFT_DELAY_MS = 500;

const fixed = (x: number, digits: number) => String(Math.round(x * 10 ** digits) / 10 ** digits);
const deviceTimeZone = () => Intl.DateTimeFormat().resolvedOptions().timeZone;

export function DigForm({
  initial,
  onSaved,
  onDiscard,
}: {
  initial: DigFormInitial;
  onSaved: (digId: string) => void;
  onDiscard: () => void;
}) {
  const t = useTranslations("dig");
  const format = useFormatter();
  const db = fieldDb();
  const readOnly = initial.readOnly;
  // Record dates (YYYY-MM-DD) are calendar days; clock times are the phone's own.
  const day = (iso: string) =>
    format.dateTime(new Date(`${iso}T12:00:00Z`), { dateStyle: "medium", timeZone: "UTC" });
  const clock = (d: Date) =>
    format.dateTime(d, { dateStyle: "medium", timeStyle: "short", timeZone: deviceTimeZone() });

  const form = useForm<DigFormValues, unknown, DigFormOutput>({
    // The schema reads looser strings than the form holds (any text where the form has a choice).
    resolver: zodResolver(digFormSchema) as Resolver<DigFormValues, unknown, DigFormOutput>,
    defaultValues: initial.values,
    mode: "onTouched",
  });
  const { register, control, setValue, getValues, formState } = form;
  const errors = formState.errors;
  const plants = useFieldArray({ control, name: "plants", keyName: "key" });
  const values = useWatch({ control }) as DigFormValues;
  const fieldId = values.fieldId;
  const plantingId = values.plantingId;

  const [photos, setPhotos] = useState<DigPhoto[]>(initial.photos);
  const [removedPlantIds, setRemovedPlantIds] = useState<string[]>(initial.removedPlantIds);
  const [removedPhotoIds, setRemovedPhotoIds] = useState<string[]>(initial.removedPhotoIds);
  const [save, setSave] = useState<SaveState>({ kind: "idle" });
  const [draft, setDraft] = useState<DraftState>(
    initial.restoredAt ? { kind: "kept", at: new Date(initial.restoredAt) } : { kind: "none" },
  );
  const [confirm, setConfirm] = useState<null | { kind: "plant"; index: number } | { kind: "discard" }>(null);

  // Reference data kept on the phone by the last pull.
  const fields = useLiveQuery(() => db.fields.toArray(), [db]);
  const accounts = useLiveQuery(() => db.accounts.toArray(), [db]);
  const products = useLiveQuery(() => db.products.toArray(), [db]);
  const plantings = useLiveQuery(
    () => (fieldId ? db.plantings.where("fieldId").equals(fieldId).sortBy("plantedOn") : []),
    [db, fieldId],
  );
  const passes = useLiveQuery(
    () => (fieldId ? db.fertilizerPasses.where("fieldId").equals(fieldId).toArray() : []),
    [db, fieldId],
  );
  const field = fields?.find((f) => f.id === fieldId) ?? null;
  const planting = plantings?.find((p) => p.id === plantingId) ?? null;

  // A field with one planting fills it in; a planting of another field is cleared.
  useEffect(() => {
    if (readOnly || !plantings) return;
    if (plantings.some((p) => p.id === getValues("plantingId"))) return;
    const only = plantings.length === 1 ? plantings[0]!.id : "";
    if (getValues("plantingId") !== only) setValue("plantingId", only, { shouldDirty: true });
  }, [plantings, readOnly, getValues, setValue]);

  // --- Draft: the whole form and its photos, kept on the phone half a second after each change.
  const draftTimer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const draftWrite = useRef<Promise<void>>(Promise.resolve());
  const draftBlocked = useRef(readOnly);
  const latest = useRef({ photos, removedPlantIds, removedPhotoIds });
  latest.current = { photos, removedPlantIds, removedPhotoIds };

  const writeDraft = useCallback(() => {
    draftTimer.current = null;
    if (draftBlocked.current) return;
    const value: DigDraft = {
      values: getValues(),
      // Saved photos' bytes are already on the phone; the draft keeps only the new ones'.
      photos: latest.current.photos.map((p) => (p.saved ? { ...p, bytes: null } : p)),
      removedPlantIds: latest.current.removedPlantIds,
      removedPhotoIds: latest.current.removedPhotoIds,
    };
    draftWrite.current = draftWrite.current
      .then(() => saveDraft(db, initial.draftKey, value))
      .then(
        () => setDraft({ kind: "kept", at: new Date() }),
        (err: unknown) => {
          console.error("The draft could not be kept", err);
          setDraft({ kind: "failed", storage: classifyStorageError(err) });
        },
      );
  }, [db, getValues, initial.draftKey]);

  const scheduleDraft = useCallback(() => {
    if (draftBlocked.current) return;
    if (draftTimer.current) clearTimeout(draftTimer.current);
    draftTimer.current = setTimeout(writeDraft, DRAFT_DELAY_MS);
  }, [writeDraft]);

  useEffect(() => {
    // What the rep types or picks; filled-in values (a location fix on load) do not make a draft.
    const sub = form.watch((_, { type }) => {
      if (type === "change") scheduleDraft();
    });
    return () => sub.unsubscribe();
  }, [form, scheduleDraft]);

  const firstPhotoRender = useRef(true);
  // biome-ignore lint/correctness/useExhaustiveDependencies: a change to the photos or removals is what triggers the draft
  useEffect(() => {
    if (firstPhotoRender.current) {
      firstPhotoRender.current = false;
      return;
    }
    scheduleDraft();
  }, [photos, removedPlantIds, removedPhotoIds, scheduleDraft]);

  useEffect(
    () => () => {
      if (draftTimer.current) clearTimeout(draftTimer.current);
    },
    [],
  );

  // --- Location: the phone's fix for the site, and the field it falls in.
  const position = usePosition();
  const [nearest, setNearest] = useState<
    null | { kind: "inside" | "near"; name: string; distanceM: number | null } | { kind: "none" }
  >(null);

  const fillPosition = useCallback(
    (fix: { lat: number; lon: number; accuracyM: number }) => {
      setValue("latitude", fixed(fix.lat, 6), { shouldDirty: true, shouldValidate: true });
      setValue("longitude", fixed(fix.lon, 6), { shouldDirty: true, shouldValidate: true });
      setValue("accuracyM", fixed(fix.accuracyM, 1), { shouldDirty: true });
    },
    [setValue],
  );

  async function takeMyLocation() {
    const fix = await position.locate();
    if (fix) fillPosition(fix);
    scheduleDraft();
  }

  async function pickNearest() {
    const fix = await position.locate();
    if (!fix || !fields) return;
    if (getValues("latitude") === "" && getValues("longitude") === "") fillPosition(fix);
    const hit = nearestField(fields, fix.lat, fix.lon);
    if (!hit) {
      setNearest({ kind: "none" });
      return;
    }
    setValue("fieldId", hit.id, { shouldDirty: true, shouldValidate: true, shouldTouch: true });
    const name = fields.find((f) => f.id === hit.id)?.name ?? "";
    setNearest({ kind: hit.inside ? "inside" : "near", name, distanceM: hit.distanceM });
    scheduleDraft();
  }

  // A new dig takes the position at once when the phone already allows it (no prompt on load).
  const autoLocated = useRef(false);
  useEffect(() => {
    if (autoLocated.current || readOnly || initial.mode !== "new") return;
    autoLocated.current = true;
    if (getValues("latitude") !== "" || !navigator.permissions?.query) return;
    navigator.permissions
      .query({ name: "geolocation" })
      .then((status) => {
        if (status.state !== "granted") return;
        return position.locate().then((fix) => {
          if (fix && getValues("latitude") === "") fillPosition(fix);
        });
      })
      // Only the silent first try: the rep still has "Use my location", which reports its errors.
      .catch(() => {});
  }, [readOnly, initial.mode, getValues, fillPosition, position]);

  // --- Plants and photos.
  const newId = () => crypto.randomUUID();
  function addPlant() {
    plants.append(emptyPlant(newId()));
    scheduleDraft();
  }
  function copyLastPlant() {
    const all = getValues("plants");
    const last = all[all.length - 1];
    plants.append(last ? copyPlant(last, newId()) : emptyPlant(newId()));
    scheduleDraft();
  }
  function removePlant(index: number) {
    const id = getValues(`plants.${index}.id`);
    plants.remove(index);
    if (initial.savedStates[id]) setRemovedPlantIds((ids) => [...ids, id]);
    const gone = photos.filter((p) => p.dugPlantId === id);
    setRemovedPhotoIds((ids) => [...ids, ...gone.filter((p) => p.saved).map((p) => p.id)]);
    setPhotos((ps) => ps.filter((p) => p.dugPlantId !== id));
    scheduleDraft();
  }
  const addPhoto = (photo: DigPhoto) => setPhotos((ps) => [...ps, photo]);
  const setCaption = (id: string, caption: string) =>
    setPhotos((ps) => ps.map((p) => (p.id === id ? { ...p, caption } : p)));
  const removePhoto = (photo: DigPhoto) => {
    setPhotos((ps) => ps.filter((p) => p.id !== photo.id));
    if (photo.saved) setRemovedPhotoIds((ids) => [...ids, photo.id]);
  };

  // --- Save: records and outbox entries in one transaction; "saved" only once it has committed.
  async function onValid(out: DigFormOutput) {
    const chosen = fields?.find((f) => f.id === out.site.fieldId);
    if (!chosen) {
      setSave({ kind: "failed", storage: "other", message: t("save.fieldMissing") });
      return;
    }
    setSave({ kind: "saving" });
    draftBlocked.current = true;
    if (draftTimer.current) clearTimeout(draftTimer.current);
    draftTimer.current = null;
    await draftWrite.current;
    try {
      await saveDig(db, {
        site: { ...out.site, accountId: chosen.accountId },
        plants: out.plants,
        newPhotos: photos
          .filter((p) => !p.saved && p.bytes)
          .map((p) => ({ meta: photoPayload(p, out.site.id), bytes: p.bytes! })),
        photoCaptions: Object.fromEntries(
          photos
            .filter((p) => p.saved && photoCaption(p) !== p.savedCaption)
            .map((p) => [p.id, photoCaption(p)]),
        ),
        removedPlantIds,
        removedPhotoIds,
        draftKey: initial.draftKey,
      });
    } catch (err) {
      console.error("The dig could not be saved", err);
      draftBlocked.current = false;
      setSave({
        kind: "failed",
        storage: classifyStorageError(err),
        message: err instanceof Error ? err.message : String(err),
      });
      return;
    }
    // Send it now when there is signal, rather than at the runner's next tick.
    requestSync();
    onSaved(out.site.id);
  }

  const onSubmit = form.handleSubmit(onValid, () => setSave({ kind: "invalid" }));

  // --- Options.
  const fieldGroups = useMemo(() => {
    if (!fields) return [];
    const accountName = new Map((accounts ?? []).map((a) => [a.id, a.name]));
    const groups = new Map<string, { name: string; fields: typeof fields }>();
    for (const f of [...fields].sort((a, b) => a.name.localeCompare(b.name))) {
      const group = groups.get(f.accountId) ?? {
        name: accountName.get(f.accountId) ?? t("field.otherAccount"),
        fields: [],
      };
      group.fields.push(f);
      groups.set(f.accountId, group);
    }
    return [...groups.values()].sort((a, b) => a.name.localeCompare(b.name));
  }, [fields, accounts, t]);

  const accuracy = Number(values.accuracyM);
  const positionMessage =
    position.state.status === "locating"
      ? t("site.locating")
      : position.state.status === "denied"
        ? t("site.denied")
        : position.state.status === "unavailable"
          ? t("site.unavailable")
          : position.state.status === "timeout"
            ? t("site.timeout")
            : position.state.status === "unsupported"
              ? t("site.unsupported")
              : null;

  const summaryPlanting = planting
    ? { id: planting.id, rowSpacingIn: planting.rowSpacingIn, soilTexture: planting.soilTexture }
    : null;

  // The selects keep their value only if their options are there when they mount.
  if (!fields || !accounts || !products) {
    return (
      <p role="status" className="mt-4">
        {t("loading")}
      </p>
    );
  }

  return (
    <FormProvider {...form}>
      <form onSubmit={onSubmit} noValidate aria-describedby={readOnly ? "dig-readonly" : undefined}>
        {readOnly ? (
          <div id="dig-readonly" className="notice-ok mb-4">
            <p className="font-bold">{t("readOnly.title")}</p>
            <p className="mt-1">{t("readOnly.body")}</p>
          </div>
        ) : null}
        {initial.restoredAt && !readOnly ? (
          <div className="notice-caution mb-4">
            <p className="font-bold">{t("draft.restored")}</p>
            <p className="mt-1">{t("draft.restoredBody", { at: clock(new Date(initial.restoredAt)) })}</p>
          </div>
        ) : null}

        <fieldset disabled={readOnly} className="min-w-0">
          <input type="hidden" {...register("id")} />

          {/* Field and planting */}
          <section aria-labelledby="where-heading" className="card">
            <h2 id="where-heading">{t("field.heading")}</h2>
            {fields.length === 0 ? <NoFields /> : null}
            <div className="mt-3">
              <label htmlFor="dig-field" className="field-label">
                {t("field.label")}
              </label>
              <select
                id="dig-field"
                className="field-input"
                aria-invalid={errors.fieldId ? true : undefined}
                aria-describedby={errors.fieldId ? "dig-field-error" : undefined}
                {...register("fieldId")}
              >
                <option value="">{t("field.choose")}</option>
                {fieldGroups.map((g) => (
                  <optgroup key={g.name} label={g.name}>
                    {g.fields.map((f) => (
                      <option key={f.id} value={f.id}>
                        {f.name}
                      </option>
                    ))}
                  </optgroup>
                ))}
              </select>
              {errors.fieldId?.message ? (
                <p id="dig-field-error" className="field-error">
                  {errors.fieldId.message}
                </p>
              ) : null}
            </div>
            {readOnly ? null : (
              <button type="button" className="btn-secondary mt-3 w-full" onClick={() => void pickNearest()}>
                {t("field.nearest")}
              </button>
            )}
            <div role="status" className="mt-2 empty:hidden">
              {nearest?.kind === "inside"
                ? t("field.inside", { name: nearest.name })
                : nearest?.kind === "near"
                  ? t("field.near", {
                      name: nearest.name,
                      m: Math.round(nearest.distanceM ?? 0),
                      ft: Math.round(metersToFeet(nearest.distanceM ?? 0)),
                    })
                  : nearest?.kind === "none"
                    ? t("field.noneMapped")
                    : null}
            </div>

            {field ? (
              <div className="mt-4">
                {plantings && plantings.length > 0 ? (
                  <SelectInput
                    label={t("planting.label")}
                    placeholder={t("planting.choose")}
                    options={plantings.map((p) => ({
                      value: p.id,
                      label: t("planting.option", { hybrid: p.hybrid, date: day(p.plantedOn) }),
                    }))}
                    registration={register("plantingId")}
                    error={errors.plantingId}
                  />
                ) : (
                  <p className="text-soil-700">{t("planting.none")}</p>
                )}
                {planting ? (
                  <dl className="mt-3 grid grid-cols-2 gap-x-4 gap-y-1 rounded-lg bg-soil-50 p-3">
                    <dt className="text-sm text-soil-700">{t("planting.hybrid")}</dt>
                    <dd className="font-semibold">{planting.hybrid}</dd>
                    <dt className="text-sm text-soil-700">{t("planting.plantedOn")}</dt>
                    <dd className="font-semibold">{day(planting.plantedOn)}</dd>
                    <dt className="text-sm text-soil-700">{t("planting.depth")}</dt>
                    <dd className="font-semibold">
                      {t("planting.inches", { value: planting.seedingDepthIn })}
                    </dd>
                    <dt className="text-sm text-soil-700">{t("planting.spacing")}</dt>
                    <dd className="font-semibold">
                      {t("planting.inches", { value: planting.rowSpacingIn })}
                    </dd>
                    <dt className="text-sm text-soil-700">{t("planting.rate")}</dt>
                    <dd className="font-semibold">
                      {t("planting.seedsPerAcre", { value: format.number(planting.seedingRate) })}
                    </dd>
                  </dl>
                ) : null}
                {field.firstIrrigationOn ? (
                  <p className="mt-2 text-sm text-soil-700">
                    {t("field.firstIrrigation", { date: day(field.firstIrrigationOn) })}
                  </p>
                ) : null}
              </div>
            ) : null}
          </section>

          {/* Site: position, time and conditions */}
          <section aria-labelledby="site-heading" className="card mt-4">
            <h2 id="site-heading">{t("site.heading")}</h2>
            {readOnly ? null : (
              <button
                type="button"
                className="btn-secondary mt-3 w-full"
                onClick={() => void takeMyLocation()}
              >
                {t("site.useLocation")}
              </button>
            )}
            <p role="status" className="mt-2 empty:hidden">
              {positionMessage}
            </p>
            <div className="mt-3 grid grid-cols-2 gap-4">
              <TextInput
                label={t("site.latitude")}
                unit="°"
                inputMode="decimal"
                registration={register("latitude", { onChange: () => setValue("accuracyM", "") })}
                error={errors.latitude}
              />
              <TextInput
                label={t("site.longitude")}
                unit="°"
                inputMode="decimal"
                registration={register("longitude", { onChange: () => setValue("accuracyM", "") })}
                error={errors.longitude}
              />
            </div>
            <p className="mt-2 text-sm text-soil-700">
              {values.accuracyM !== "" && Number.isFinite(accuracy)
                ? t("site.accuracy", { m: Math.round(accuracy), ft: Math.round(metersToFeet(accuracy)) })
                : values.latitude !== ""
                  ? t("site.byHand")
                  : t("site.noPosition")}
            </p>
            <TextInput
              className="mt-4"
              type="datetime-local"
              label={t("site.dugAt")}
              registration={register("dugAt")}
              error={errors.dugAt}
            />
            <div className="mt-4">
              <RadioChoices
                legend={t("site.soilMoisture")}
                options={[...SOIL_MOISTURE.map((m) => ({ value: m, label: t(`site.moisture.${m}`) }))]}
                columns={4}
                registration={register("soilMoisture")}
                error={errors.soilMoisture}
              />
            </div>
            <TextInput
              className="mt-4"
              label={t("site.soilTemp")}
              unit="°F"
              inputMode="decimal"
              registration={register("soilTempF")}
              error={errors.soilTempF}
            />
            <div className="mt-4">
              <RadioChoices
                legend={t("site.irrigatedYet")}
                options={[
                  { value: "no", label: t("site.irrigatedNo") },
                  { value: "yes", label: t("site.irrigatedYes") },
                ]}
                registration={register("irrigatedYet")}
                error={errors.irrigatedYet}
              />
            </div>
            <PhotoStrip
              owner={t("photos.ownerDig")}
              dugPlantId={null}
              photos={photos.filter((p) => p.dugPlantId === null)}
              readOnly={readOnly}
              onAdd={addPhoto}
              onCaption={setCaption}
              onRemove={removePhoto}
            />
          </section>

          {/* Dug plants */}
          <section aria-labelledby="plants-heading" className="mt-6">
            <h2 id="plants-heading">{t("plants.heading", { count: plants.fields.length })}</h2>
            {errors.plants?.message || errors.plants?.root?.message ? (
              <p className="field-error" role="alert">
                {errors.plants?.message ?? errors.plants?.root?.message}
              </p>
            ) : null}
            {plants.fields.map((row, index) => (
              <PlantCard
                key={row.key}
                index={index}
                plantId={row.id}
                readOnly={readOnly}
                canRemove={!readOnly && initial.savedStates[row.id] !== "synced"}
                onRemove={() => setConfirm({ kind: "plant", index })}
                photos={photos.filter((p) => p.dugPlantId === row.id)}
                onAddPhoto={addPhoto}
                onCaption={setCaption}
                onRemovePhoto={removePhoto}
              />
            ))}
            {readOnly ? null : (
              <div className="mt-4 grid grid-cols-2 gap-3">
                <button type="button" className="btn-secondary" onClick={addPlant}>
                  {t("plants.add")}
                </button>
                <button
                  type="button"
                  className="btn-secondary"
                  onClick={copyLastPlant}
                  disabled={plants.fields.length === 0}
                >
                  {t("plants.copyLast")}
                </button>
              </div>
            )}
          </section>

          <LiveSummary
            values={values}
            planting={summaryPlanting}
            passes={passes ?? []}
            products={products ?? []}
          />

          {/* The rep's own conclusions */}
          <section aria-labelledby="advice-heading" className="card mt-6">
            <h2 id="advice-heading">{t("advice.heading")}</h2>
            <div className="mt-3">
              <TextArea
                label={t("advice.recommendation")}
                hint={t("advice.recommendationHint")}
                rows={5}
                maxLength={4000}
                registration={register("recommendation")}
                error={errors.recommendation}
              />
            </div>
            <label className="mt-4 flex min-h-tap cursor-pointer items-start gap-3 rounded-lg border-2 border-soil-500 p-3 has-checked:border-caution-700 has-checked:bg-caution-50">
              <input
                type="checkbox"
                className="mt-1 size-6 accent-caution-700"
                aria-describedby="flag-hint"
                {...register("flaggedByRep")}
              />
              <span>
                <span className="font-bold">{t("advice.flag")}</span>
                <span id="flag-hint" className="block text-sm text-soil-700">
                  {t("advice.flagHint")}
                </span>
              </span>
            </label>
            <div className="mt-4">
              <TextArea
                label={t("advice.notes")}
                rows={3}
                maxLength={4000}
                registration={register("notes")}
                error={errors.notes}
              />
            </div>
          </section>
        </fieldset>

        {readOnly ? null : (
          <div className="mt-6 space-y-3">
            {save.kind === "invalid" ? (
              <div role="alert" className="notice-error">
                <p className="font-bold">{t("save.invalid")}</p>
              </div>
            ) : null}
            {save.kind === "failed" ? (
              <div role="alert" className="notice-error">
                <p className="font-bold">{t(`save.failed.${save.storage}.title`)}</p>
                <p className="mt-1">{t(`save.failed.${save.storage}.body`, { message: save.message })}</p>
              </div>
            ) : null}
            <button type="submit" className="btn-primary w-full text-lg" disabled={save.kind === "saving"}>
              {save.kind === "saving" ? t("save.saving") : t("save.button")}
            </button>
            <p className="text-sm text-soil-700">
              {draft.kind === "kept"
                ? t("draft.kept", { at: clock(draft.at) })
                : draft.kind === "failed"
                  ? t(`draft.failed.${draft.storage}`)
                  : t("draft.none")}
            </p>
            {draft.kind !== "none" ? (
              <button
                type="button"
                className="btn-secondary w-full"
                onClick={() => setConfirm({ kind: "discard" })}
              >
                {t("draft.discard")}
              </button>
            ) : null}
          </div>
        )}
      </form>

      <ConfirmDialog
        open={confirm?.kind === "plant"}
        title={confirm?.kind === "plant" ? t("plants.removeTitle", { n: confirm.index + 1 }) : ""}
        body={
          confirm?.kind === "plant"
            ? t("plants.removeBody", {
                photos: photos.filter((p) => p.dugPlantId === getValues(`plants.${confirm.index}.id`)).length,
              })
            : ""
        }
        confirmLabel={t("plants.removeConfirm")}
        cancelLabel={t("cancel")}
        onConfirm={() => {
          if (confirm?.kind === "plant") removePlant(confirm.index);
          setConfirm(null);
        }}
        onCancel={() => setConfirm(null)}
      />
      <ConfirmDialog
        open={confirm?.kind === "discard"}
        title={t("draft.discardTitle")}
        body={initial.mode === "new" ? t("draft.discardBodyNew") : t("draft.discardBodyEdit")}
        confirmLabel={t("draft.discardConfirm")}
        cancelLabel={t("cancel")}
        onConfirm={() => {
          setConfirm(null);
          draftBlocked.current = true;
          if (draftTimer.current) clearTimeout(draftTimer.current);
          void draftWrite.current.then(onDiscard);
        }}
        onCancel={() => setConfirm(null)}
      />
    </FormProvider>
  );
}

// No reference data on the phone yet: it arrives with the first pull, which needs signal.
function NoFields() {
  const t = useTranslations("dig.field");
  const [state, setState] = useState<"idle" | "pulling" | "failed">("idle");
  async function download() {
    setState("pulling");
    try {
      await pullNow(fieldDb());
      setState("idle");
    } catch (err) {
      console.error("Downloading the fields failed", err);
      setState("failed");
    }
  }
  return (
    <div className="notice-caution mt-3">
      <p className="font-bold">{t("noneTitle")}</p>
      <p className="mt-1">{t("noneBody")}</p>
      <button
        type="button"
        className="btn-secondary mt-3"
        onClick={() => void download()}
        disabled={state === "pulling"}
      >
        {state === "pulling" ? t("downloading") : t("download")}
      </button>
      {state === "failed" ? (
        <p role="alert" className="field-error">
          {t("downloadFailed")}
        </p>
      ) : null}
    </div>
  );
}
