import { NextResponse } from "next/server";
import { listMailMessages } from "@/db/queries/notifications";
import { smtpUrl } from "@/lib/server/mailer";
import { defineRoute, jsonError } from "@/lib/server/route";

/** Site administrators: every e-mail the app wrote, newest first (`?to=` one address, `?limit=` up to 200). */
export const GET = defineRoute({ outsideProject: "signed-in" }, async ({ req, user }) => {
  if (!user.isAdmin) return jsonError(403, "Only site administrators can read the outbox.");
  const q = req.nextUrl.searchParams;
  const limit = Math.min(Math.max(Number.parseInt(q.get("limit") ?? "50", 10) || 50, 1), 200);
  const to = q.get("to")?.trim().toLowerCase().slice(0, 254) || undefined;
  const messages = await listMailMessages({ limit, to });
  return NextResponse.json({
    delivery: smtpUrl() ? "smtp" : "outbox",
    messages: messages.map((m) => ({
      id: m.id,
      kind: m.kind,
      projectId: m.projectId,
      to: m.toAddress,
      toName: m.toName,
      subject: m.subject,
      text: m.text,
      html: m.html,
      status: m.status,
      attempts: m.attempts,
      lastError: m.lastError,
      createdAt: m.createdAt,
      sentAt: m.sentAt,
    })),
  });
});
