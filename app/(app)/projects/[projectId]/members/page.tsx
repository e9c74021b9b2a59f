import { formatTolerance, toleranceFor } from "@/lib/airflow/tolerance";
import type { Metadata } from "next";
import { Card } from "@/components/ui/card";
import { NotAllowed } from "@/components/ui/not-allowed";
import { listProjectMembers } from "@/db/queries/members";
import { requireProjectPage } from "@/lib/auth/guards";
import { ROLE_LABELS } from "@/lib/auth/policy";
import { FORM_UNITS, formatIn } from "@/lib/design/quantities";
import { unitSystemFor } from "@/lib/units";

export const metadata: Metadata = { title: "Members" };

export default async function MembersPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const page = await requireProjectPage(projectId, "members.manage");
  if (!page.allowed) return <NotAllowed what="managing members" />;
  const { project } = page.access;
  const u = FORM_UNITS[unitSystemFor(page.user, project)];
  const members = await listProjectMembers({ projectId });
  return (
    <main className="mx-auto grid max-w-7xl items-start gap-gutter px-gutter py-6 lg:grid-cols-3">
      <Card title="Members" className="lg:col-span-2">
        <table className="w-full text-left">
          <thead className="border-b-2 border-line text-sm text-ink-muted">
            <tr>
              <th className="py-2 pr-3">Name</th>
              <th className="py-2 pr-3">E-mail</th>
              <th className="py-2 pr-3">Role</th>
              <th className="py-2">Member since</th>
            </tr>
          </thead>
          <tbody>
            {members.map((m) => (
              <tr key={m.userId} className="border-b border-line">
                <td className="py-2 pr-3 font-semibold">{m.name}</td>
                <td className="py-2 pr-3">{m.email}</td>
                <td className="py-2 pr-3">{ROLE_LABELS[m.role]}</td>
                <td className="py-2">{m.since.toISOString().slice(0, 10)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Card>
      <Card title="Project settings">
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
          <dt className="text-ink-muted">Site</dt>
          <dd>{project.siteName}</dd>
          <dt className="text-ink-muted">Address</dt>
          <dd>{project.address || "—"}</dd>
          <dt className="text-ink-muted">Altitude</dt>
          <dd className="num">{formatIn(u.altitude, project.altitudeM, 4)}</dd>
          <dt className="text-ink-muted">Units</dt>
          <dd>{project.unitSystem === "IP" ? "Inch-pound" : "SI"}</dd>
          <dt className="text-ink-muted">Standard air</dt>
          <dd className="num">{formatIn(u.density, project.standardDensityKgM3, 4)}</dd>
          <dt className="text-ink-muted">Terminals</dt>
          <dd className="num">{formatTolerance(toleranceFor(project, "outlet"))} of design</dd>
          <dt className="text-ink-muted">Duct sections</dt>
          <dd className="num">{formatTolerance(toleranceFor(project, "section"))} of design</dd>
          <dt className="text-ink-muted">Fans</dt>
          <dd className="num">{formatTolerance(toleranceFor(project, "fan"))} of design</dd>
          <dt className="text-ink-muted">Continuity</dt>
          <dd className="num">±{project.continuityTolerancePct} % by mass</dd>
        </dl>
      </Card>
    </main>
  );
}
