"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/text-field";
import { ApiError } from "@/lib/api-client";
import { acceptInvitation } from "@/lib/api-client/people";
import { PASSWORD_MIN as MIN } from "@/lib/validation/auth";

export function AcceptInvitationForm({ token, email }: { token: string; email: string }) {
  const router = useRouter();
  const [name, setName] = useState("");
  const [password, setPassword] = useState("");
  const [again, setAgain] = useState("");
  const [fields, setFields] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setMessage(null);
    const local: Record<string, string> = {};
    if (!name.trim()) local.name = "Enter your name as colleagues know it.";
    if (password.length < MIN) local.password = `Use at least ${MIN} characters.`;
    if (again !== password) local.again = "The two passwords differ.";
    setFields(local);
    if (Object.keys(local).length) return;
    setBusy(true);
    try {
      const out = await acceptInvitation(token, { name, password });
      router.replace(out.next);
      router.refresh();
    } catch (err) {
      const e = err instanceof ApiError ? err : new ApiError(0, "Something went wrong; try again.");
      setMessage(e.message);
      setFields(e.fields);
      setPassword("");
      setAgain("");
      setBusy(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <p>
        Your account will be <strong>{email}</strong>.
      </p>
      <TextField id="name" label="Your name" autoComplete="name" required value={name} onChange={(e) => setName(e.target.value)} error={fields.name} maxLength={120} />
      <TextField id="new-password" label={`Choose a password (at least ${MIN} characters)`} type="password" autoComplete="new-password" required value={password} onChange={(e) => setPassword(e.target.value)} error={fields.password} maxLength={200} />
      <TextField id="password-again" label="The same password again" type="password" autoComplete="new-password" required value={again} onChange={(e) => setAgain(e.target.value)} error={fields.again} maxLength={200} />
      <div aria-live="polite">
        {message && (
          <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft px-3 py-2 font-semibold text-fault">
            {message}
          </p>
        )}
      </div>
      <Button type="submit" disabled={busy} className="w-full">
        {busy ? "Creating your account…" : "Create my account"}
      </Button>
    </form>
  );
}
