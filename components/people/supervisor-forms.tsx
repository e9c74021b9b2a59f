"use client";

import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/text-field";
import { ApiError } from "@/lib/api-client";
import { usePeopleMutations } from "@/lib/api-client/people";

export function DesignateSupervisorForm({
  projectId,
  technicians,
  current,
}: {
  projectId: string;
  technicians: { userId: string; name: string }[];
  current: { userId: string; certifyingBody: string; certificateNumber: string } | null;
}) {
  const router = useRouter();
  const selectId = useId();
  const { designate } = usePeopleMutations(projectId);
  const [userId, setUserId] = useState(current?.userId ?? technicians[0]?.userId ?? "");
  const [body, setBody] = useState(current?.certifyingBody ?? "");
  const [number, setNumber] = useState(current?.certificateNumber ?? "");
  const error = designate.error instanceof ApiError ? designate.error : null;
  if (technicians.length === 0) return <p className="text-ink-soft">Invite a technician first: the TAB supervisor is one of the project&apos;s technicians.</p>;

  return (
    <form
      noValidate
      className="grid gap-4"
      onSubmit={(e) => {
        e.preventDefault();
        designate.mutate({ userId, certifyingBody: body, certificateNumber: number }, { onSuccess: () => router.refresh() });
      }}
    >
      <div>
        <label htmlFor={selectId} className="mb-1 block font-semibold">
          Technician
        </label>
        <select id={selectId} value={userId} onChange={(e) => setUserId(e.target.value)} className="min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-3">
          {technicians.map((t) => (
            <option key={t.userId} value={t.userId}>
              {t.name}
            </option>
          ))}
        </select>
      </div>
      <TextField id="certifying-body" label="Certifying body" value={body} onChange={(e) => setBody(e.target.value)} error={error?.fields.certifyingBody} maxLength={200} />
      <TextField id="certificate-number" label="Certificate number" value={number} onChange={(e) => setNumber(e.target.value)} error={error?.fields.certificateNumber} maxLength={80} />
      <div aria-live="polite">
        {error && (
          <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft px-3 py-2 font-semibold text-fault">
            {error.message}
          </p>
        )}
      </div>
      <Button type="submit" variant="secondary" disabled={designate.isPending}>
        {current ? "Save the designation" : "Designate as TAB supervisor"}
      </Button>
    </form>
  );
}

export function SignStatementForm({ projectId }: { projectId: string }) {
  const router = useRouter();
  const confirmId = useId();
  const { sign } = usePeopleMutations(projectId);
  const [password, setPassword] = useState("");
  const [confirm, setConfirm] = useState(false);
  const error = sign.error instanceof ApiError ? sign.error : null;
  return (
    <form
      noValidate
      className="grid gap-4"
      onSubmit={(e) => {
        e.preventDefault();
        sign.mutate({ password, confirm: confirm as true }, { onSuccess: () => router.refresh(), onSettled: () => setPassword("") });
      }}
    >
      <label htmlFor={confirmId} className="flex min-h-touch items-start gap-3">
        <input id={confirmId} type="checkbox" checked={confirm} onChange={(e) => setConfirm(e.target.checked)} className="mt-1 h-6 w-6 shrink-0" />
        <span>I have reviewed the data and make the statement above as my own.</span>
      </label>
      {error?.fields.confirm && <p className="text-sm font-semibold text-fault">{error.fields.confirm}</p>}
      <TextField id="sign-password" label="Your password, to sign" type="password" autoComplete="current-password" value={password} onChange={(e) => setPassword(e.target.value)} error={error?.fields.password} maxLength={200} />
      <div aria-live="polite">
        {error && (
          <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft px-3 py-2 font-semibold text-fault">
            {error.message}
          </p>
        )}
      </div>
      <Button type="submit" disabled={sign.isPending}>
        {sign.isPending ? "Signing…" : "Sign the statement"}
      </Button>
    </form>
  );
}
