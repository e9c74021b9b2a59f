"use client";

import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/text-field";
import type { MemberRole } from "@/db/schema";
import { ApiError } from "@/lib/api-client";
import { usePeopleMutations } from "@/lib/api-client/people";

export const ROLE_CHOICES: { value: MemberRole; label: string }[] = [
  { value: "technician", label: "Technician" },
  { value: "commissioning_agent", label: "Commissioning agent" },
  { value: "engineer", label: "Engineer of record" },
  { value: "owner", label: "Owner" },
];

export function InviteForm({ projectId, mayInviteEngineer }: { projectId: string; mayInviteEngineer: boolean }) {
  const router = useRouter();
  const roleId = useId();
  const { invite } = usePeopleMutations(projectId);
  const [email, setEmail] = useState("");
  const [role, setRole] = useState<MemberRole>("technician");
  const [done, setDone] = useState<string | null>(null);
  const error = invite.error instanceof ApiError ? invite.error : null;

  function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setDone(null);
    invite.mutate(
      { email, role },
      {
        onSuccess: (out) => {
          setDone(out.kind === "member" ? `${email} already had an account and was added to the project.` : `Invitation sent to ${email}. The link works once, for 72 hours.`);
          setEmail("");
          router.refresh();
        },
      },
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4">
      <TextField id="invite-email" label="E-mail" type="email" autoComplete="off" value={email} onChange={(e) => setEmail(e.target.value)} error={error?.fields.email} maxLength={254} />
      <div>
        <label htmlFor={roleId} className="mb-1 block font-semibold">
          Role
        </label>
        <select id={roleId} value={role} onChange={(e) => setRole(e.target.value as MemberRole)} className="min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-3" aria-describedby={error?.fields.role ? `${roleId}-error` : undefined}>
          {ROLE_CHOICES.filter((r) => mayInviteEngineer || r.value !== "engineer").map((r) => (
            <option key={r.value} value={r.value}>
              {r.label}
            </option>
          ))}
        </select>
        {error?.fields.role && (
          <p id={`${roleId}-error`} className="mt-1 text-sm font-semibold text-fault">
            {error.fields.role}
          </p>
        )}
      </div>
      <div aria-live="polite">
        {error && (
          <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft px-3 py-2 font-semibold text-fault">
            {error.message}
          </p>
        )}
        {done && <p className="font-semibold text-ok">{done}</p>}
      </div>
      <Button type="submit" disabled={invite.isPending}>
        {invite.isPending ? "Sending…" : "Send invitation"}
      </Button>
    </form>
  );
}
