import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { Card, EmptyState } from "@/components/ui/card";
import { listMailMessages } from "@/db/queries/notifications";
import { requireUser } from "@/lib/auth/guards";
import { smtpUrl } from "@/lib/server/mailer";

export const metadata: Metadata = { title: "Outbox" };

const STATUS_WORDS = { outbox: "Kept here (no mail server)", queued: "Waiting to send", sending: "Sending", sent: "Sent", failed: "Not delivered" } as const;

/** Shows a plain-text e-mail with its web addresses as links, so an invitation can be followed from here. */
function TextWithLinks({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s<>"]+)/g);
  return (
    <pre className="overflow-x-auto whitespace-pre-wrap break-words rounded-card bg-paper-sunk p-3 font-sans text-sm">
      {parts.map((part, i) =>
        /^https?:\/\//.test(part) ? (
          <a key={i} href={part} className="font-semibold text-accent-strong underline">
            {part}
          </a>
        ) : (
          part
        ),
      )}
    </pre>
  );
}

export default async function OutboxPage() {
  const user = await requireUser();
  if (!user.isAdmin) notFound();
  const messages = await listMailMessages({ limit: 100 });
  const smtp = smtpUrl() !== null;
  return (
    <main className="mx-auto grid max-w-5xl gap-gutter px-gutter py-6">
      <h1>Outbox</h1>
      <p className="max-w-3xl text-ink-soft">
        {smtp
          ? "Every e-mail Airtally writes, and whether the mail server (SMTP_URL) took it."
          : "No mail server is configured (SMTP_URL), so e-mails are kept here instead of being sent. Each one is exactly what would have gone out."}{" "}
        The newest 100 are shown.
      </p>
      {messages.length === 0 ? (
        <EmptyState>No e-mail has been written yet. Invitations, submissions, decisions and issued reports write one.</EmptyState>
      ) : (
        <ul className="grid gap-gutter">
          {messages.map((m) => (
            <li key={m.id}>
              <Card title={m.subject}>
                <dl className="mb-3 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
                  <dt className="text-ink-muted">To</dt>
                  <dd>{m.toName ? `${m.toName} <${m.toAddress}>` : m.toAddress}</dd>
                  <dt className="text-ink-muted">Written</dt>
                  <dd className="num">{m.createdAt.toISOString().slice(0, 19).replace("T", " ")} UTC</dd>
                  <dt className="text-ink-muted">State</dt>
                  <dd>
                    {STATUS_WORDS[m.status]}
                    {m.status === "failed" || (m.lastError && m.status !== "sent") ? ` — ${m.lastError}` : ""}
                  </dd>
                </dl>
                <TextWithLinks text={m.text} />
              </Card>
            </li>
          ))}
        </ul>
      )}
    </main>
  );
}
