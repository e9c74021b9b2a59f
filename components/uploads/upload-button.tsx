"use client";

import { useId, useRef, useState } from "react";
import { ApiError } from "@/lib/api-client";
import { UPLOAD_MAX_BYTES, uploadFile } from "@/lib/api-client/uploads";

interface Props<T> {
  /** Where the multipart POST goes (field `file`). */
  url: string;
  /** The button's words, e.g. "Add a photo of S1.2". */
  label: string;
  accept: string;
  /** "environment": the tablet's rear camera opens directly. */
  capture?: "environment" | "user";
  /** Extra form fields sent with the file. */
  fields?: Record<string, string>;
  /** What is accepted, shown under the button. */
  hint?: string;
  onUploaded?: (answer: T) => void;
  /** A smaller button (still a full touch target) with the hint beside it, for a row among others. */
  compact?: boolean;
}

/**
 * A large, gloved-thumb-sized button that picks a file (or opens the camera), uploads it with a
 * visible progress bar, and says plainly what went wrong. The server decides what is accepted.
 */
export function UploadButton<T>({ url, label, accept, capture, fields = {}, hint, onUploaded, compact = false }: Props<T>) {
  const inputId = useId();
  const hintId = useId();
  const input = useRef<HTMLInputElement>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);

  async function onChange(event: React.ChangeEvent<HTMLInputElement>) {
    const file = event.target.files?.[0];
    event.target.value = ""; // the same file can be chosen again after a failure
    if (!file) return;
    setError(null);
    setDone(null);
    if (file.size > UPLOAD_MAX_BYTES) {
      setError(`"${file.name}" is ${(file.size / 1048576).toFixed(1)} MB; at most 10 MB can be uploaded. Nothing was sent.`);
      return;
    }
    setProgress(0);
    try {
      const answer = await uploadFile<T>(url, file, fields, setProgress);
      setDone(`"${file.name}" saved.`);
      onUploaded?.(answer);
    } catch (err) {
      setError(err instanceof ApiError ? err.message : "The upload failed; nothing was saved. Try again.");
    } finally {
      setProgress(null);
    }
  }

  const busy = progress !== null;
  return (
    <div className={compact ? "flex flex-wrap items-center gap-x-3 gap-y-1" : "grid justify-items-start gap-1"}>
      <label
        htmlFor={inputId}
        className={`inline-flex cursor-pointer items-center justify-center gap-2 rounded-card border-2 border-accent bg-paper-raised font-semibold text-accent-strong hover:bg-accent-soft focus-within:outline focus-within:outline-3 focus-within:outline-offset-2 focus-within:outline-accent ${compact ? "min-h-touch px-3 text-sm" : "min-h-14 px-5 text-base"} ${busy ? "pointer-events-none opacity-60" : ""}`}
      >
        <svg viewBox="0 0 24 24" width="22" height="22" aria-hidden="true">
          <path d="M4 8h3l2-3h6l2 3h3v11H4z" fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinejoin="round" />
          <circle cx="12" cy="13" r="3.5" fill="none" stroke="currentColor" strokeWidth="1.8" />
        </svg>
        {busy ? "Uploading…" : label}
        <input
          ref={input}
          id={inputId}
          type="file"
          accept={accept}
          capture={capture}
          className="sr-only"
          disabled={busy}
          aria-describedby={hint ? hintId : undefined}
          onChange={onChange}
        />
      </label>
      {hint && (
        <p id={hintId} className="text-sm text-ink-muted">
          {hint}
        </p>
      )}
      <div aria-live="polite" className="grid gap-1">
        {busy && (
          <p className="flex items-center gap-2 text-sm">
            <progress max={1} value={progress} className="h-3 w-40" aria-label="Upload progress" />
            <span className="num">{Math.round((progress ?? 0) * 100)} % sent</span>
          </p>
        )}
        {done && <p className="text-sm font-semibold text-ok">{done}</p>}
        {error && (
          <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft px-3 py-2 text-sm font-semibold text-fault">
            {error}
          </p>
        )}
      </div>
    </div>
  );
}
