"use client";

/**
 * The technician's Submit action: enabled only when the submission checks pass on what the server has
 * (the reasons are listed otherwise), when everything typed has reached the server, and when there is
 * network: a submission is a decision the server makes, so it is never queued on the device.
 */
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useMutation } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { ApiError } from "@/lib/api-client";
import { problemLabel } from "@/lib/review/submission";

export interface SubmitPanelProps {
  /** "the traverse of S1.3", "the terminal readings of AHU-1". */
  what: string;
  status: "draft" | "submitted" | "approved" | "returned";
  problems: Record<string, string>;
  /** Something typed on this device has not reached the server yet. */
  pendingOnDevice: boolean;
  online: boolean;
  lastReview: { decision: "approved" | "returned"; comment: string; reviewerName: string | null; at: string } | null;
  onSubmit: () => Promise<unknown>;
}

export function SubmitPanel(props: SubmitPanelProps) {
  const { what, problems, pendingOnDevice, online, lastReview, onSubmit } = props;
  const router = useRouter();
  const [done, setDone] = useState(false);
  // Submitted here: shown at once, before the page's refresh brings the new state.
  const status = done ? "submitted" : props.status;
  const mutation = useMutation({
    mutationFn: onSubmit,
    onSuccess: () => {
      setDone(true);
      router.refresh();
    },
  });
  const serverProblems = mutation.error instanceof ApiError ? mutation.error.fields : {};
  const reasons = { ...problems, ...serverProblems };
  const blockers: string[] = [];
  if (!online) blockers.push("Submitting needs the network, and this device is offline. Everything you typed is kept on this device and is sent when the network is back; submit then.");
  else if (pendingOnDevice) blockers.push("Some readings are kept on this device and have not reached the server yet: wait until the screen says Saved.");
  const canSubmit = (status === "draft" || status === "returned") && Object.keys(reasons).length === 0 && blockers.length === 0 && !done;

  return (
    <section aria-label={`Submit ${what}`} className="grid gap-3 rounded-card border-2 border-line bg-paper-raised p-gutter">
      {status === "returned" && lastReview?.decision === "returned" && (
        <div role="note" className="rounded-card border-2 border-fault bg-fault-soft p-3">
          <p className="font-semibold text-fault">Returned by {lastReview.reviewerName ?? "the commissioning agent"} on {new Date(lastReview.at).toISOString().slice(0, 16).replace("T", " ")} UTC:</p>
          <blockquote className="mt-1 text-lg">“{lastReview.comment}”</blockquote>
          <p className="mt-1 text-sm">Correct what is asked, then submit again.</p>
        </div>
      )}
      {status === "submitted" && <p className="font-semibold">Submitted for review: the readings are locked until the commissioning agent approves or returns them.</p>}
      {status === "approved" && <p className="font-semibold">Approved{lastReview?.reviewerName ? ` by ${lastReview.reviewerName}` : ""}. The readings are locked; new readings start a new revision.</p>}
      {(status === "draft" || status === "returned") && (
        <>
          <div className="flex flex-wrap items-center gap-3">
            <Button type="button" disabled={!canSubmit || mutation.isPending} onClick={() => mutation.mutate()} aria-describedby="submit-reasons">
              {status === "returned" ? "Submit again for review" : "Submit for review"}
            </Button>
            {done && <p role="status">Submitted.</p>}
          </div>
          <div id="submit-reasons" aria-live="polite">
            {(blockers.length > 0 || Object.keys(reasons).length > 0) && (
              <>
                <p className="font-semibold">Not ready to submit {what}:</p>
                <ul className="list-disc pl-5">
                  {blockers.map((b) => (
                    <li key={b}>{b}</li>
                  ))}
                  {Object.entries(reasons).map(([field, reason]) => (
                    <li key={field}>
                      <span className="font-semibold">{problemLabel(field)}</span> {reason}
                    </li>
                  ))}
                </ul>
              </>
            )}
            {mutation.error && !(mutation.error instanceof ApiError && Object.keys(mutation.error.fields).length > 0) && (
              <p className="font-semibold text-fault">{mutation.error.message}</p>
            )}
          </div>
        </>
      )}
    </section>
  );
}
