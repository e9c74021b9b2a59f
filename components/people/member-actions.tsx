"use client";

import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import type { MemberRole } from "@/db/schema";
import { ApiError } from "@/lib/api-client";
import { usePeopleMutations } from "@/lib/api-client/people";
import { ROLE_CHOICES } from "./invite-form";

/** Role change and removal for one member row; the server decides, this only asks. */
export function MemberActions({ projectId, userId, name, role, mayChangeEngineers }: { projectId: string; userId: string; name: string; role: MemberRole; mayChangeEngineers: boolean }) {
  const router = useRouter();
  const selectId = useId();
  const { changeRole, remove } = usePeopleMutations(projectId);
  const [error, setError] = useState<string | null>(null);
  const fail = (err: unknown) => setError(err instanceof ApiError ? err.message : "That did not work; try again.");
  const choices = ROLE_CHOICES.filter((r) => mayChangeEngineers || r.value !== "engineer" || r.value === role);

  return (
    <div className="grid gap-1">
      <div className="flex flex-wrap items-center gap-2">
        <label htmlFor={selectId} className="sr-only">
          Role of {name}
        </label>
        <select
          id={selectId}
          value={role}
          disabled={changeRole.isPending}
          onChange={(e) => {
            setError(null);
            changeRole.mutate({ userId, role: e.target.value as MemberRole }, { onSuccess: () => router.refresh(), onError: fail });
          }}
          className="min-h-touch rounded-card border-2 border-line-strong bg-paper-raised px-2"
        >
          {choices.map((r) => (
            <option key={r.value} value={r.value}>
              {r.label}
            </option>
          ))}
        </select>
        <button
          type="button"
          className="min-h-touch rounded-card border border-line-strong px-3 font-semibold text-fault hover:bg-fault-soft"
          disabled={remove.isPending}
          onClick={() => {
            if (!window.confirm(`Remove ${name} from this project? Their past readings and decisions stay on record.`)) return;
            setError(null);
            remove.mutate(userId, { onSuccess: () => router.refresh(), onError: fail });
          }}
        >
          Remove<span className="sr-only"> {name}</span>
        </button>
      </div>
      {error && (
        <p role="alert" className="text-sm font-semibold text-fault">
          {error}
        </p>
      )}
    </div>
  );
}

export function WithdrawInvitation({ projectId, invitationId, email }: { projectId: string; invitationId: string; email: string }) {
  const router = useRouter();
  const { withdraw } = usePeopleMutations(projectId);
  return (
    <button
      type="button"
      className="min-h-touch rounded-card border border-line-strong px-3 font-semibold text-fault hover:bg-fault-soft"
      disabled={withdraw.isPending}
      onClick={() => withdraw.mutate(invitationId, { onSuccess: () => router.refresh() })}
    >
      Withdraw<span className="sr-only"> the invitation to {email}</span>
    </button>
  );
}
