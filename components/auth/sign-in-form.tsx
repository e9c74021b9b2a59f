"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";

interface FieldErrors {
  email?: string;
  password?: string;
}

export function SignInForm() {
  const router = useRouter();
  const [email, setEmail] = useState("");
  const [password, setPassword] = useState("");
  const [message, setMessage] = useState<string | null>(null);
  const [fields, setFields] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setBusy(true);
    setMessage(null);
    setFields({});
    try {
      const res = await fetch("/api/auth/sign-in", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ email, password }),
      });
      if (res.ok) {
        router.replace("/projects");
        router.refresh();
        return;
      }
      const body = (await res.json().catch(() => null)) as { error?: { message?: string; fields?: FieldErrors } } | null;
      setMessage(body?.error?.message ?? `Sign-in failed (HTTP ${res.status}).`);
      setFields(body?.error?.fields ?? {});
      setPassword("");
    } catch {
      setMessage("The server cannot be reached. Check the connection and try again.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <div>
        <label htmlFor="email" className="mb-1 block font-semibold">
          E-mail
        </label>
        <input
          id="email"
          name="email"
          type="email"
          autoComplete="username"
          required
          value={email}
          onChange={(e) => setEmail(e.target.value)}
          aria-invalid={fields.email ? true : undefined}
          aria-describedby={fields.email ? "email-error" : undefined}
          className="min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 text-base"
        />
        {fields.email && (
          <p id="email-error" className="mt-1 text-sm font-semibold text-fault">
            {fields.email}
          </p>
        )}
      </div>
      <div>
        <label htmlFor="password" className="mb-1 block font-semibold">
          Password
        </label>
        <input
          id="password"
          name="password"
          type="password"
          autoComplete="current-password"
          required
          value={password}
          onChange={(e) => setPassword(e.target.value)}
          aria-invalid={fields.password ? true : undefined}
          aria-describedby={fields.password ? "password-error" : undefined}
          className="min-h-touch w-full rounded-card border-2 border-line-strong bg-paper-raised px-3 text-base"
        />
        {fields.password && (
          <p id="password-error" className="mt-1 text-sm font-semibold text-fault">
            {fields.password}
          </p>
        )}
      </div>
      <div aria-live="polite">
        {message && (
          <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft px-3 py-2 font-semibold text-fault">
            {message}
          </p>
        )}
      </div>
      <Button type="submit" disabled={busy} className="w-full">
        {busy ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
