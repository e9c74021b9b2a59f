"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { ApiError, call } from "./index";

export const UPLOAD_MAX_BYTES = 10 * 1024 * 1024;

export interface PhotoItem {
  id: string;
  sectionId: string;
  traverseId: string | null;
  contentType: string;
  bytes: number;
  width: number | null;
  height: number | null;
  fileName: string;
  caption: string;
  takenBy: string | null;
  takenByName: string | null;
  createdAt: string;
  url: string;
  thumbUrl: string;
}

/** An instrument's current calibration certificate, as GET/POST …/instruments/{id}/certificate describe it. */
export interface CertificateItem {
  id: string;
  instrumentId: string;
  contentType: string;
  bytes: number;
  fileName: string;
  uploadedBy: string | null;
  uploadedByName: string | null;
  createdAt: string;
  /** The file, through our route. */
  url: string;
  /** An image certificate's thumbnail; null for a PDF. */
  thumbUrl: string | null;
}

/**
 * Sends one file as multipart/form-data with upload progress (fetch cannot report it, XHR can).
 * Resolves with the JSON answer; rejects with ApiError carrying the server's message.
 */
export function uploadFile<T>(url: string, file: File, fields: Record<string, string>, onProgress: (fraction: number) => void, signal?: AbortSignal): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const form = new FormData();
    for (const [k, v] of Object.entries(fields)) form.append(k, v);
    form.append("file", file);
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.responseType = "json";
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      const body = xhr.response as (T & { error?: { message: string; fields?: Record<string, string> } }) | null;
      if (xhr.status >= 200 && xhr.status < 300) resolve(body as T);
      else reject(new ApiError(xhr.status, body?.error?.message ?? `The server answered ${xhr.status}; nothing was saved.`, body?.error?.fields));
    };
    xhr.onerror = () => reject(new ApiError(0, "The upload did not reach the server (no signal?). Nothing was saved; try again when connected."));
    xhr.onabort = () => reject(new ApiError(0, "Upload cancelled; nothing was saved."));
    signal?.addEventListener("abort", () => xhr.abort());
    xhr.send(form);
  });
}

export const photoKeys = (projectId: string, sectionId: string) => ["photos", projectId, sectionId] as const;

export function useSectionPhotos(projectId: string, sectionId: string) {
  return useQuery({
    queryKey: photoKeys(projectId, sectionId),
    queryFn: async () => (await call<{ photos: PhotoItem[] }>(`/api/v1/projects/${projectId}/sections/${sectionId}/photos`)).photos,
  });
}

export function useDeletePhoto(projectId: string, sectionId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (photo: PhotoItem) => call<void>(photo.url, { method: "DELETE" }),
    onSuccess: () => client.invalidateQueries({ queryKey: photoKeys(projectId, sectionId) }),
  });
}
