"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { ApiError } from "@/lib/api-client";
import { photoKeys, useDeletePhoto, useSectionPhotos, type PhotoItem } from "@/lib/api-client/uploads";
import { PhotoGallery } from "./photo-gallery";
import { UploadButton } from "./upload-button";

interface Props {
  projectId: string;
  sectionId: string;
  sectionTag: string;
  currentUserId: string;
  /** The technician may add photos; others only look. */
  canAdd: boolean;
  /** The section's readings are approved: photos stay as they are. */
  locked: boolean;
}

/** Photos of one traverse location: the thumbnails, and the camera button for the technician. */
export function SectionPhotos({ projectId, sectionId, sectionTag, currentUserId, canAdd, locked }: Props) {
  const client = useQueryClient();
  const photos = useSectionPhotos(projectId, sectionId);
  const remove = useDeletePhoto(projectId, sectionId);
  const [error, setError] = useState<string | null>(null);
  const list = photos.data ?? [];

  function onRemove(photo: PhotoItem) {
    setError(null);
    remove.mutate(photo, { onError: (err) => setError(err instanceof ApiError ? err.message : "The photo could not be removed.") });
  }

  return (
    <div className="grid gap-1">
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        <p className="text-sm text-ink-muted">
          {photos.isPending ? "Loading photos…" : photos.isError ? "Photos could not be loaded." : list.length === 0 ? "No photo of this location yet." : `${list.length} photo${list.length === 1 ? "" : "s"} of this location`}
        </p>
        <PhotoGallery
          photos={list}
          label={`Photos of ${sectionTag}`}
          canRemove={(p) => canAdd && !locked && p.takenBy === currentUserId}
          onRemove={onRemove}
          removing={remove.isPending ? (remove.variables?.id ?? null) : null}
        />
        {canAdd && (
          <UploadButton<{ photo: PhotoItem }>
            compact
            url={`/api/v1/projects/${projectId}/sections/${sectionId}/photos`}
            label={`Add a photo of ${sectionTag}`}
            accept="image/*"
            capture="environment"
            hint="JPEG or PNG, at most 10 MB."
            onUploaded={() => void client.invalidateQueries({ queryKey: photoKeys(projectId, sectionId) })}
          />
        )}
      </div>
      {error && (
        <p role="alert" className="text-sm font-semibold text-fault">
          {error}
        </p>
      )}
    </div>
  );
}
