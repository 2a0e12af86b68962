import type { SyncState } from "@/sync/client/db";
import type { PhotoPayload } from "@/sync/protocol";

// A photo as the dig form holds it: taken in this session (bytes kept until the dig is saved, and in
// the draft meanwhile) or already saved on the phone.
export interface DigPhoto {
  id: string;
  dugPlantId: string | null;
  sha256: string;
  byteSize: number;
  contentType: PhotoPayload["contentType"];
  width: number | null;
  height: number | null;
  capturedAt: string | null;
  caption: string;
  /** The compressed bytes; null when they are no longer on this phone (uploaded and cleared). */
  bytes: ArrayBuffer | null;
  /** Already stored on this phone by an earlier save. */
  saved: boolean;
  /** The caption as last saved, to know whether it changed. */
  savedCaption: string | null;
  syncState: SyncState | null;
}

export const photoCaption = (p: DigPhoto): string | null =>
  p.caption.trim() === "" ? null : p.caption.trim();

export function photoPayload(p: DigPhoto, digSiteId: string): PhotoPayload {
  return {
    id: p.id,
    digSiteId,
    dugPlantId: p.dugPlantId,
    sha256: p.sha256,
    byteSize: p.byteSize,
    contentType: p.contentType,
    width: p.width,
    height: p.height,
    caption: photoCaption(p),
    capturedAt: p.capturedAt,
  };
}
