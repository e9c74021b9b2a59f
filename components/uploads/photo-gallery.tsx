"use client";

import type { PhotoItem } from "@/lib/api-client/uploads";

interface Props {
  photos: PhotoItem[];
  /** Who may remove a photo: its technician, while the section is open. */
  canRemove?: (photo: PhotoItem) => boolean;
  onRemove?: (photo: PhotoItem) => void;
  removing?: string | null;
  /** Names the photos for assistive technology, e.g. "Photos of S1.2". */
  label: string;
}

/**
 * Small thumbnails that open the full photo, each with its caption, who took it and when, in one
 * line that wraps: a section row of the Field work hub stays about as tall as the thumbnails.
 */
export function PhotoGallery({ photos, canRemove, onRemove, removing, label }: Props) {
  if (photos.length === 0) return null;
  return (
    <ul aria-label={label} className="flex flex-wrap items-center gap-3">
      {photos.map((p) => (
        <li key={p.id} className="flex items-center gap-2 text-xs text-ink-soft">
          <a href={p.url} target="_blank" rel="noopener" className="block shrink-0 overflow-hidden rounded-card border border-line bg-paper-sunk">
            {/* Served by our own route behind the session: the framework's image optimizer would fetch it without the cookie. */}
            {/* eslint-disable-next-line @next/next/no-img-element */}
            <img src={p.thumbUrl} alt={p.caption || `Photo ${p.fileName || ""} of the traverse location`} width={64} height={48} loading="lazy" className="h-12 w-16 object-cover" />
          </a>
          <span className="grid max-w-40">
            {p.caption && <span className="truncate text-ink">{p.caption}</span>}
            <span className="truncate">
              {p.takenByName ?? "Unknown"} · <span className="num">{p.createdAt.slice(0, 10)}</span>
            </span>
          </span>
          {canRemove?.(p) && onRemove && (
            <button type="button" className="min-h-touch rounded-card border border-line-strong px-2 text-sm font-semibold text-fault hover:bg-fault-soft" disabled={removing === p.id} onClick={() => onRemove(p)}>
              {removing === p.id ? "Removing…" : "Remove"}
              <span className="sr-only"> {p.caption || p.fileName || "this photo"}</span>
            </button>
          )}
        </li>
      ))}
    </ul>
  );
}
