"use client";

import { useTranslations } from "next-intl";
import { useEffect, useId, useRef, useState } from "react";
import { PHOTO_TYPES } from "@/sync/protocol";
import type { DigPhoto } from "./dig-photos";

function Thumbnail({ photo, alt }: { photo: DigPhoto; alt: string }) {
  const [url, setUrl] = useState<string | null>(null);
  useEffect(() => {
    if (!photo.bytes) return;
    const objectUrl = URL.createObjectURL(new Blob([photo.bytes], { type: photo.contentType }));
    setUrl(objectUrl);
    return () => URL.revokeObjectURL(objectUrl);
  }, [photo.bytes, photo.contentType]);
  if (!url) {
    return (
      <span className="flex h-28 w-36 items-center justify-center rounded-lg bg-soil-100 text-sm">{alt}</span>
    );
  }
  // biome-ignore lint/performance/noImgElement: a local object URL, not an optimisable remote image
  return <img src={url} alt={alt} className="h-28 w-36 rounded-lg object-cover" />;
}

interface Pending {
  key: string;
  name: string;
  progress: number;
}

/**
 * The photos of the dig or of one plant: take or pick photos (compressed on the phone, no network),
 * a thumbnail strip with a caption for each, removable until the photo has synced.
 */
export function PhotoStrip({
  owner,
  dugPlantId,
  photos,
  readOnly,
  onAdd,
  onCaption,
  onRemove,
}: {
  /** "the dig" or "plant 2": names the controls for screen readers. */
  owner: string;
  dugPlantId: string | null;
  photos: DigPhoto[];
  readOnly: boolean;
  onAdd: (photo: DigPhoto) => void;
  onCaption: (id: string, caption: string) => void;
  onRemove: (photo: DigPhoto) => void;
}) {
  const t = useTranslations("dig.photos");
  const headingId = useId();
  const [pending, setPending] = useState<Pending[]>([]);
  const [error, setError] = useState<string | null>(null);
  const mounted = useRef(true);
  useEffect(() => {
    mounted.current = true;
    return () => {
      mounted.current = false;
    };
  }, []);

  async function addFiles(files: File[]) {
    setError(null);
    for (const file of files) {
      const key = crypto.randomUUID();
      setPending((p) => [...p, { key, name: file.name, progress: 0 }]);
      try {
        if (!file.type.startsWith("image/")) throw new Error(`not an image: ${file.type}`);
        // The compression library loads with the first photo, not with the form (it is precached).
        const { preparePhoto } = await import("./compress-photo");
        const prepared = await preparePhoto(file, (progress) =>
          setPending((p) => p.map((x) => (x.key === key ? { ...x, progress } : x))),
        );
        if (!mounted.current) return;
        onAdd({
          id: crypto.randomUUID(),
          dugPlantId,
          sha256: prepared.sha256,
          byteSize: prepared.byteSize,
          contentType: PHOTO_TYPES.includes(prepared.contentType) ? prepared.contentType : "image/jpeg",
          width: prepared.width,
          height: prepared.height,
          capturedAt: prepared.capturedAt,
          caption: "",
          bytes: prepared.bytes,
          saved: false,
          savedCaption: null,
          syncState: null,
        });
      } catch (err) {
        console.error("A photo could not be prepared", err);
        if (mounted.current) setError(t("failed", { name: file.name }));
      } finally {
        if (mounted.current) setPending((p) => p.filter((x) => x.key !== key));
      }
    }
  }

  return (
    <section aria-labelledby={headingId} className="mt-4">
      <h4 id={headingId} className="font-semibold">
        {t("heading", { owner, count: photos.length })}
      </h4>
      {photos.length > 0 ? (
        <ul className="-mx-1 mt-2 flex gap-3 overflow-x-auto px-1 pb-2">
          {photos.map((photo, i) => (
            <li key={photo.id} className="w-40 shrink-0">
              <figure>
                <Thumbnail photo={photo} alt={t("alt", { owner, n: i + 1 })} />
                <figcaption className="mt-1 text-xs text-soil-700">
                  {t("size", {
                    kb: Math.round(photo.byteSize / 1024),
                    w: photo.width ?? 0,
                    h: photo.height ?? 0,
                  })}
                </figcaption>
              </figure>
              <label className="mt-1 block text-sm font-semibold" htmlFor={`${photo.id}-caption`}>
                {t("caption", { n: i + 1 })}
              </label>
              <input
                id={`${photo.id}-caption`}
                type="text"
                className="field-input text-sm"
                maxLength={500}
                value={photo.caption}
                readOnly={readOnly}
                onChange={(e) => onCaption(photo.id, e.target.value)}
              />
              {!readOnly && photo.syncState !== "synced" ? (
                <button
                  type="button"
                  className="btn-secondary mt-2 w-full"
                  aria-label={t("removeLabel", { owner, n: i + 1 })}
                  onClick={() => onRemove(photo)}
                >
                  {t("remove")}
                </button>
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
      <div role="status" aria-live="polite">
        {pending.map((p) => (
          <p key={p.key} className="mt-2 text-sm">
            <span className="font-semibold">{t("compressing", { progress: Math.round(p.progress) })}</span>
            <progress className="ml-2 align-middle" max={100} value={p.progress} aria-label={t("progress")} />
          </p>
        ))}
      </div>
      {error ? (
        <p role="alert" className="field-error">
          {error}
        </p>
      ) : null}
      {readOnly ? null : (
        <label className="btn-secondary mt-2 w-full cursor-pointer focus-within:outline-3 focus-within:outline-water-500">
          <input
            type="file"
            accept="image/*"
            capture="environment"
            multiple
            className="sr-only"
            disabled={pending.length > 0}
            onChange={(e) => {
              const files = Array.from(e.target.files ?? []);
              e.target.value = "";
              void addFiles(files);
            }}
          />
          <CameraIcon />
          {t("add", { owner })}
        </label>
      )}
    </section>
  );
}

function CameraIcon() {
  return (
    <svg
      aria-hidden="true"
      viewBox="0 0 24 24"
      className="size-6"
      fill="none"
      stroke="currentColor"
      strokeWidth="2"
    >
      <path d="M4 8h3l2-3h6l2 3h3v11H4z" strokeLinejoin="round" />
      <circle cx="12" cy="13" r="3.5" />
    </svg>
  );
}
