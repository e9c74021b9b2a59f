import type { Metadata } from "next";
import { ActivityTable } from "@/components/review/activity-table";
import { NotAllowed } from "@/components/ui/not-allowed";
import type { AuditEvent } from "@/lib/api-client/review";
import { requireProjectPage } from "@/lib/auth/guards";
import { listProjectAudit } from "@/lib/server/audit-feed";

export const metadata: Metadata = { title: "Activity" };

export default async function ActivityPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { access, allowed } = await requireProjectPage(projectId, "audit.view");
  if (!allowed) return <NotAllowed what="reading the project's activity" />;
  const first = await listProjectAudit(access.project, { limit: 100 });
  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <h2>Activity</h2>
      <p className="text-ink-soft">Everything recorded on this project: submissions, decisions and their comments, re-traverses, readings, samples, design and people changes. The record only grows; nothing in it can be changed or deleted.</p>
      <ActivityTable projectId={access.project.id} initial={JSON.parse(JSON.stringify(first)) as { events: AuditEvent[]; nextBefore: number | null }} />
    </main>
  );
}
