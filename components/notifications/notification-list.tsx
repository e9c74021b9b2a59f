"use client";

import Link from "next/link";
import { ApiError } from "@/lib/api-client";
import { useMarkRead, useNotifications, type NotificationItem } from "@/lib/api-client/notifications";
import { Button } from "@/components/ui/button";

const KIND_WORDS: Record<string, string> = {
  "traverse.submitted": "Submitted for review",
  "traverse.returned": "Returned to you",
  "traverse.approved": "Approved",
  "terminal_set.submitted": "Submitted for review",
  "terminal_set.returned": "Returned to you",
  "terminal_set.approved": "Approved",
  "report.issued": "Report issued",
  invitation: "Invitation",
  "member.added": "Added to a project",
};

export function NotificationList({ initial }: { initial: { notifications: NotificationItem[]; unread: number } }) {
  const { data } = useNotifications(initial);
  const mark = useMarkRead();
  const list = data.notifications;
  return (
    <div className="grid gap-3">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="num" aria-live="polite">
          {data.unread === 0 ? "Nothing unread." : `${data.unread} unread`}
        </p>
        {data.unread > 0 && (
          <Button variant="secondary" disabled={mark.isPending} onClick={() => mark.mutate({ all: true })}>
            Mark all as read
          </Button>
        )}
      </div>
      {mark.isError && (
        <p role="alert" className="font-semibold text-fault">
          {mark.error instanceof ApiError ? mark.error.message : "Could not mark them read."}
        </p>
      )}
      {list.length === 0 ? (
        <p className="rounded-card border border-dashed border-line-strong bg-paper p-4 text-ink-soft">No notifications yet. Submissions, decisions and issued reports of your projects show up here.</p>
      ) : (
        <ul className="divide-y divide-line rounded-card border border-line bg-paper-raised">
          {list.map((n) => (
            <li key={n.id} className={`grid gap-1 p-4 md:grid-cols-[1fr_auto] md:items-center ${n.readAt ? "" : "bg-accent-soft/40"}`}>
              <div>
                <p className="flex flex-wrap items-center gap-2 text-sm text-ink-muted">
                  {!n.readAt && <span className="rounded-full border border-accent bg-paper-raised px-2 text-xs font-bold text-accent-strong">Unread</span>}
                  <span>{KIND_WORDS[n.kind] ?? n.kind}</span>
                  <span className="num">· {n.createdAt.slice(0, 16).replace("T", " ")} UTC</span>
                </p>
                <p className={n.readAt ? "" : "font-semibold"}>
                  {n.link ? (
                    <Link href={n.link} className="underline-offset-4 hover:underline" onClick={() => !n.readAt && mark.mutate({ ids: [n.id] })}>
                      {n.message}
                    </Link>
                  ) : (
                    n.message
                  )}
                </p>
              </div>
              {!n.readAt && (
                <Button variant="quiet" disabled={mark.isPending} onClick={() => mark.mutate({ ids: [n.id] })} aria-label={`Mark read: ${n.message}`}>
                  Mark read
                </Button>
              )}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
