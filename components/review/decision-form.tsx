"use client";

/**
 * Approve or return, with a comment that a return requires (said beside the field before the server
 * is asked, and the server's own message when it refuses). Used per item and for a whole system.
 */
import { useId, useState } from "react";
import { useMutation } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { ApiError } from "@/lib/api-client";
import type { DecisionInput } from "@/lib/api-client/review";
import { MIN_RETURN_COMMENT } from "@/lib/validation/review";

export function DecisionForm({
  label,
  onDecide,
  onDone,
  allowWitnessed = true,
  suggestReturn = false,
}: {
  /** What is decided on, for the buttons' accessible names ("S1.3", "everything submitted in AHU-1"). */
  label: string;
  onDecide: (input: DecisionInput) => Promise<unknown>;
  onDone: (decision: DecisionInput["decision"]) => void;
  allowWitnessed?: boolean;
  suggestReturn?: boolean;
}) {
  const id = useId();
  const [comment, setComment] = useState("");
  const [witnessed, setWitnessed] = useState(false);
  const [fieldError, setFieldError] = useState<string | null>(null);
  const mutation = useMutation({
    mutationFn: (input: DecisionInput) => onDecide(input),
    onSuccess: (_, input) => {
      setComment("");
      onDone(input.decision);
    },
    onError: (err) => {
      if (err instanceof ApiError && err.fields.comment) setFieldError(err.fields.comment);
    },
  });
  const decide = (decision: DecisionInput["decision"]) => {
    setFieldError(null);
    if (decision === "return" && comment.trim().length < MIN_RETURN_COMMENT) {
      setFieldError(`Say what should be corrected (at least ${MIN_RETURN_COMMENT} characters): a return needs a comment.`);
      return;
    }
    mutation.mutate({ decision, ...(comment.trim() ? { comment: comment.trim() } : {}), ...(allowWitnessed ? { witnessed } : {}) });
  };
  const error = mutation.error instanceof ApiError && !mutation.error.fields.comment ? mutation.error.message : mutation.error && !(mutation.error instanceof ApiError) ? "Something went wrong; nothing was changed." : null;
  return (
    <div className="grid gap-3">
      <div>
        <label htmlFor={`${id}-comment`} className="mb-1 block font-semibold">
          Comment <span className="font-normal text-ink-soft">(required to return)</span>
        </label>
        <textarea
          id={`${id}-comment`}
          value={comment}
          onChange={(e) => setComment(e.target.value)}
          rows={2}
          maxLength={2000}
          aria-invalid={fieldError ? true : undefined}
          aria-describedby={fieldError ? `${id}-comment-error` : undefined}
          className="w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 py-2"
        />
        <p id={`${id}-comment-error`} aria-live="polite" className="text-sm font-semibold text-fault">
          {fieldError}
        </p>
      </div>
      {allowWitnessed && (
        <label className="flex min-h-touch cursor-pointer items-center gap-2">
          <input type="checkbox" checked={witnessed} onChange={(e) => setWitnessed(e.target.checked)} className="h-6 w-6" />I was present while these readings were taken (witnessed)
        </label>
      )}
      <div className="flex flex-wrap gap-3">
        <Button type="button" onClick={() => decide("approve")} disabled={mutation.isPending} variant={suggestReturn ? "secondary" : "primary"}>
          Approve<span className="sr-only"> {label}</span>
        </Button>
        <Button type="button" onClick={() => decide("return")} disabled={mutation.isPending} variant={suggestReturn ? "primary" : "secondary"}>
          Return<span className="sr-only"> {label}</span> with comment
        </Button>
      </div>
      <p role="status" aria-live="polite" className="text-sm font-semibold text-fault">
        {error}
      </p>
    </div>
  );
}
