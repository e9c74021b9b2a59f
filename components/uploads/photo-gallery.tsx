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

/** Thumbnails that open the full photo; each says who took it and when. */
export function PhotoGallery({ photos, canRemove, onRemove, removing, label }: Props) {
  if (photos.length === 0) return null;
  return (
    <ul aria-label={label} className="flex flex-wrap items-start gap-3">
      {photos.map((p) => (
        <li key={p.id} className="grid w-32 content-start gap-1 text-xs text-ink-soft">
          <a href={p.url} target="_blank" rel="noopener" className="block overflow-hidden rounded-card border border-line bg-paper-sunk">
            {/* Served by our own route behind the session: the framework's image optimizer would fetch it without the cookie. */}
            {/* eslint-disable-next-line @next/next/no-img-element */}
            <img src={p.thumbUrl} alt={p.caption || `Photo ${p.fileName || ""} of the traverse location`} width={128} height={96} loading="lazy" className="h-24 w-32 object-cover" />
          </a>
          {p.caption && <span className="line-clamp-2 text-ink">{p.caption}</span>}
          <span>
            {p.takenByName ?? "Unknown"} · <span className="num">{p.createdAt.slice(0, 10)}</span>
          </span>
          {canRemove?.(p) && onRemove && (
            <button type="button" className="min-h-touch rounded-card border border-line-strong px-2 font-semibold text-fault hover:bg-fault-soft" disabled={removing === p.id} onClick={() => onRemove(p)}>
              {removing === p.id ? "Removing…" : "Remove"}
            </button>
          )}
        </li>
      ))}
    </ul>
  );
}
