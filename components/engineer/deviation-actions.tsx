"use client";

/**
 * The engineer of record's controls on a result outside its band: accept it with a reason, or
 * withdraw a standing acceptance with a reason. The server records its own value of the result.
 */
import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { ApiError, call } from "@/lib/api-client";
import { MAX_REASON_CHARS, MIN_REASON_CHARS } from "@/lib/validation/deviations";

type Mode = { kind: "accept"; subject: string; entityId: string; measure: string } | { kind: "withdraw"; deviationId: string };

export function DeviationAction({ projectId, label, mode }: { projectId: string; label: string; mode: Mode }) {
  const router = useRouter();
  const id = useId();
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const verb = mode.kind === "accept" ? "Accept deviation" : "Withdraw acceptance";

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setBusy(true);
    setError(null);
    try {
      if (mode.kind === "accept") {
        await call(`/api/v1/projects/${projectId}/deviations`, {
          method: "POST",
          body: JSON.stringify({ subject: mode.subject, entityId: mode.entityId, measure: mode.measure, reason }),
        });
      } else {
        await call(`/api/v1/projects/${projectId}/deviations/${mode.deviationId}/withdrawal`, { method: "POST", body: JSON.stringify({ reason }) });
      }
      setOpen(false);
      setReason("");
      router.refresh();
    } catch (err) {
      setError(err instanceof ApiError ? (err.fields.reason ? `Reason ${err.fields.reason}.` : err.message) : "Could not save; nothing was changed.");
    } finally {
      setBusy(false);
    }
  }

  if (!open)
    return (
      <Button type="button" variant="secondary" className="min-h-touch px-3 text-sm" onClick={() => setOpen(true)} aria-label={`${verb}: ${label}`}>
        {verb}…
      </Button>
    );
  return (
    <form onSubmit={submit} className="mt-2 grid gap-2 rounded-card border border-line-strong bg-paper p-3">
      <label htmlFor={`${id}-reason`} className="font-semibold">
        {mode.kind === "accept" ? `Why is ${label} acceptable as measured?` : `Why withdraw the acceptance of ${label}?`}
      </label>
      <textarea
        id={`${id}-reason`}
        value={reason}
        onChange={(e) => setReason(e.target.value)}
        rows={3}
        maxLength={MAX_REASON_CHARS}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : `${id}-hint`}
        className="w-full rounded-card border-2 border-line-strong bg-paper-raised p-2 text-base"
      />
      <p id={`${id}-hint`} className="text-sm text-ink-soft">
        At least {MIN_REASON_CHARS} characters. Recorded with your name and the time in the audit log{mode.kind === "accept" ? ", with the value as measured now" : ""}.
      </p>
      {error && (
        <p id={`${id}-error`} role="alert" className="text-sm font-semibold text-fault">
          {error}
        </p>
      )}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={busy}>
          {busy ? "Saving…" : verb}
        </Button>
        <Button type="button" variant="quiet" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
