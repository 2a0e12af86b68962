"use client";

import Link from "next/link";
import { useSearchParams } from "next/navigation";
import { useTranslations } from "next-intl";
import { useEffect, useRef, useState } from "react";
import { digToFormValues, emptyDig, emptyPlant } from "@/lib/digs/form-schema";
import { fieldDb, type SyncState } from "@/sync/client/db";
import { clearDraft, loadLocalDig } from "@/sync/client/records";
import { classifyStorageError } from "@/sync/client/storage";
import { isRecordId } from "@/lib/records/schemas";
import type { DigPhoto } from "./dig-photos";
import { type DigDraft, DigForm, type DigFormInitial } from "./dig-form";
import { SafetyDialog } from "./safety-dialog";

export const NEW_DIG_DRAFT = "dig:new";
const editDraftKey = (id: string) => `dig:${id}`;
export const editHref = (id: string) => `/field/digs/edit?id=${encodeURIComponent(id)}`;

type State =
  | { kind: "loading" }
  | { kind: "ready"; initial: DigFormInitial }
  | { kind: "notFound" }
  | { kind: "failed"; error: unknown }
  | { kind: "saved"; id: string };

function freshDig(): DigDraft {
  const values = emptyDig(crypto.randomUUID());
  values.plants = [emptyPlant(crypto.randomUUID())];
  return { values, photos: [], removedPlantIds: [], removedPhotoIds: [] };
}

async function loadNew(): Promise<DigFormInitial> {
  const db = fieldDb();
  const row = await db.drafts.get(NEW_DIG_DRAFT);
  const draft = (row?.value as DigDraft | undefined) ?? null;
  return {
    ...(draft ?? freshDig()),
    mode: "new",
    draftKey: NEW_DIG_DRAFT,
    restoredAt: draft ? (row?.updatedAt ?? null) : null,
    savedStates: {},
    readOnly: false,
  };
}

async function loadEdit(id: string): Promise<DigFormInitial | null> {
  const db = fieldDb();
  const dig = await loadLocalDig(db, id);
  if (!dig) return null;
  const savedStates: Record<string, SyncState> = {};
  for (const r of [dig.site, ...dig.plants, ...dig.photos]) savedStates[r.id] = r.syncState;
  // Editable until the whole dig has synced; then the office copy is the one to correct.
  const readOnly = Object.values(savedStates).every((s) => s === "synced");
  const bytes = await db.photoBytes.bulkGet(dig.photos.map((p) => p.id));
  const savedPhotos: DigPhoto[] = dig.photos.map((p, i) => ({
    id: p.id,
    dugPlantId: p.dugPlantId,
    sha256: p.sha256,
    byteSize: p.byteSize,
    contentType: p.contentType,
    width: p.width,
    height: p.height,
    capturedAt: p.capturedAt,
    caption: p.caption ?? "",
    bytes: bytes[i]?.bytes ?? null,
    saved: true,
    savedCaption: p.caption,
    syncState: p.syncState,
  }));
  const key = editDraftKey(id);
  const row = readOnly ? undefined : await db.drafts.get(key);
  const draft = (row?.value as DigDraft | undefined) ?? null;
  if (draft) {
    const savedBytes = new Map(savedPhotos.map((p) => [p.id, p.bytes]));
    return {
      ...draft,
      photos: draft.photos.map((p) => (p.saved ? { ...p, bytes: savedBytes.get(p.id) ?? null } : p)),
      mode: "edit",
      draftKey: key,
      restoredAt: row?.updatedAt ?? null,
      savedStates,
      readOnly,
    };
  }
  return {
    values: digToFormValues(dig),
    photos: savedPhotos,
    removedPlantIds: [],
    removedPhotoIds: [],
    mode: "edit",
    draftKey: key,
    restoredAt: null,
    savedStates,
    readOnly,
  };
}

/**
 * The new-dig and edit-dig screen. Everything comes from this phone's database, so it works with no
 * signal; the server only checked sign-in when the page was first stored.
 */
export function DigEditor({ mode }: { mode: "new" | "edit" }) {
  const t = useTranslations("dig");
  const params = useSearchParams();
  const id = mode === "edit" ? params.get("id") : null;
  const [state, setState] = useState<State>({ kind: "loading" });
  const [generation, setGeneration] = useState(0);
  const savedHeading = useRef<HTMLHeadingElement>(null);

  // biome-ignore lint/correctness/useExhaustiveDependencies: a new generation reloads the dig on purpose
  useEffect(() => {
    let cancelled = false;
    setState({ kind: "loading" });
    const load = mode === "new" ? loadNew() : id && isRecordId(id) ? loadEdit(id) : Promise.resolve(null);
    load.then(
      (initial) => {
        if (!cancelled) setState(initial ? { kind: "ready", initial } : { kind: "notFound" });
      },
      (error: unknown) => {
        console.error("The dig could not be loaded from this phone", error);
        if (!cancelled) setState({ kind: "failed", error });
      },
    );
    return () => {
      cancelled = true;
    };
  }, [mode, id, generation]);

  useEffect(() => {
    if (state.kind === "saved") savedHeading.current?.focus();
  }, [state.kind]);

  async function discard(key: string) {
    try {
      await clearDraft(fieldDb(), key);
    } catch (err) {
      console.error("The draft could not be discarded", err);
    }
    setGeneration((g) => g + 1);
  }

  return (
    <>
      {mode === "new" ? <SafetyDialog /> : null}
      {state.kind === "loading" ? (
        <p role="status" className="mt-4">
          {t("loading")}
        </p>
      ) : null}
      {state.kind === "notFound" ? (
        <div className="notice-caution mt-4">
          <p className="font-bold">{t("notFound.title")}</p>
          <p className="mt-1">{t("notFound.body")}</p>
          <Link href="/field/digs" className="btn-secondary mt-3">
            {t("saved.toList")}
          </Link>
        </div>
      ) : null}
      {state.kind === "failed" ? (
        <div role="alert" className="notice-error mt-4">
          <p className="font-bold">{t(`loadFailed.${classifyStorageError(state.error)}`)}</p>
          <button type="button" className="btn-secondary mt-3" onClick={() => setGeneration((g) => g + 1)}>
            {t("retry")}
          </button>
        </div>
      ) : null}
      {state.kind === "ready" ? (
        <DigForm
          key={`${state.initial.values.id}-${generation}`}
          initial={state.initial}
          onSaved={(digId) => setState({ kind: "saved", id: digId })}
          onDiscard={() => void discard(state.initial.draftKey)}
        />
      ) : null}
      {state.kind === "saved" ? (
        <div className="notice-ok mt-4" role="status">
          <h2 ref={savedHeading} tabIndex={-1}>
            {t("saved.title")}
          </h2>
          <p className="mt-1">{t("saved.body")}</p>
          <div className="mt-4 flex flex-col gap-3">
            <Link href="/field/digs" className="btn-primary">
              {t("saved.toList")}
            </Link>
            {mode === "new" ? (
              <button type="button" className="btn-secondary" onClick={() => setGeneration((g) => g + 1)}>
                {t("saved.another")}
              </button>
            ) : (
              <Link href="/field/digs/new" className="btn-secondary">
                {t("saved.another")}
              </Link>
            )}
            {mode === "new" ? (
              <Link href={editHref(state.id)} className="btn-secondary">
                {t("saved.keepEditing")}
              </Link>
            ) : (
              <button type="button" className="btn-secondary" onClick={() => setGeneration((g) => g + 1)}>
                {t("saved.keepEditing")}
              </button>
            )}
          </div>
        </div>
      ) : null}
    </>
  );
}
