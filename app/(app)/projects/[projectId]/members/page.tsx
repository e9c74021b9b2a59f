import { formatTolerance, toleranceFor } from "@/lib/airflow/tolerance";
import type { Metadata } from "next";
import { Card, EmptyState } from "@/components/ui/card";
import { NotAllowed } from "@/components/ui/not-allowed";
import { InviteForm } from "@/components/people/invite-form";
import { MemberActions, WithdrawInvitation } from "@/components/people/member-actions";
import { DesignateSupervisorForm, SignStatementForm } from "@/components/people/supervisor-forms";
import { listOpenInvitations, listProjectMembers } from "@/db/queries/members";
import { requireProjectPage } from "@/lib/auth/guards";
import { can, ROLE_LABELS } from "@/lib/auth/policy";
import { FORM_UNITS, formatIn } from "@/lib/design/quantities";
import { getSupervisorState } from "@/lib/server/supervisor";
import { unitSystemFor } from "@/lib/units";

export const metadata: Metadata = { title: "Members" };

const when = (d: Date) => `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;

export default async function MembersPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const page = await requireProjectPage(projectId, "members.view");
  if (!page.allowed) return <NotAllowed what="seeing the project's members" />;
  const { user, access } = page;
  const { project } = access;
  const u = FORM_UNITS[unitSystemFor(user, project)];
  const mayInvite = can(user, access.role, "members.invite");
  const mayManage = can(user, access.role, "members.manage");
  const [members, invitations, supervisor] = await Promise.all([
    listProjectMembers({ projectId }),
    mayInvite ? listOpenInvitations({ projectId }) : Promise.resolve([]),
    getSupervisorState({ projectId }),
  ]);
  const technicians = members.filter((m) => m.role === "technician");
  const isSupervisor = supervisor.designation?.userId === user.id;

  return (
    <main className="mx-auto grid max-w-7xl items-start gap-gutter px-gutter py-6 lg:grid-cols-3">
      <div className="grid gap-gutter lg:col-span-2">
        <Card title="Members">
          <div className="overflow-x-auto">
            <table className="w-full text-left">
              <thead className="border-b-2 border-line text-sm text-ink-muted">
                <tr>
                  <th className="py-2 pr-3">Name and e-mail</th>
                  <th className="py-2 pr-3">Role</th>
                  <th className="py-2 pr-3">Since</th>
                  {mayInvite && <th className="py-2">Change</th>}
                </tr>
              </thead>
              <tbody>
                {members.map((m) => {
                  const changeable = mayInvite && (mayManage || (m.userId !== user.id && m.role !== "engineer"));
                  return (
                    <tr key={m.userId} className="border-b border-line align-top">
                      <td className="py-2 pr-3">
                        <span className="font-semibold">{m.name}</span>
                        {supervisor.designation?.userId === m.userId && <span className="ml-2 whitespace-nowrap rounded-full border border-accent px-2 text-xs text-accent-strong">TAB supervisor</span>}
                        <span className="block text-sm text-ink-soft [overflow-wrap:anywhere]">{m.email}</span>
                      </td>
                      <td className="py-2 pr-3">{ROLE_LABELS[m.role]}</td>
                      <td className="num whitespace-nowrap py-2 pr-3">{m.since.toISOString().slice(0, 10)}</td>
                      {mayInvite && (
                        <td className="py-2">
                          {changeable ? (
                            <MemberActions projectId={projectId} userId={m.userId} name={m.name} role={m.role} mayChangeEngineers={mayManage} />
                          ) : (
                            <span className="text-sm text-ink-muted">{m.userId === user.id ? "You" : "Site administrators change engineers"}</span>
                          )}
                        </td>
                      )}
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        </Card>

        {mayInvite && (
          <Card title="Open invitations">
            {invitations.length === 0 ? (
              <EmptyState>No open invitations. Invite people with the form on this page; each link works once, for 72 hours.</EmptyState>
            ) : (
              <ul className="divide-y divide-line">
                {invitations.map((inv) => {
                  const expired = inv.expired;
                  return (
                    <li key={inv.id} className="flex flex-wrap items-center justify-between gap-3 py-2">
                      <div>
                        <p className="font-semibold break-all">{inv.email}</p>
                        <p className="text-sm text-ink-soft">
                          {ROLE_LABELS[inv.role]} · invited by {inv.invitedByName ?? "someone"} ·{" "}
                          {expired ? <strong className="text-fault">expired {when(inv.expiresAt)}</strong> : <>expires {when(inv.expiresAt)}</>}
                        </p>
                      </div>
                      <WithdrawInvitation projectId={projectId} invitationId={inv.id} email={inv.email} />
                    </li>
                  );
                })}
              </ul>
            )}
          </Card>
        )}

        <Card title="TAB supervisor">
          <p className="mb-3 max-w-prose text-ink-soft">
            The project&apos;s certified test-and-balance supervisor is one of its technicians. Before the closeout report is issued they sign the statement below in Airtally. Their
            certification is a person&apos;s; the server&apos;s digital signature on the report file is a separate thing and proves only that the file is unchanged.
          </p>
          {supervisor.designation ? (
            <dl className="mb-4 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
              <dt className="text-ink-muted">Supervisor</dt>
              <dd className="font-semibold">{supervisor.designation.name}</dd>
              <dt className="text-ink-muted">Certified by</dt>
              <dd>{supervisor.designation.certifyingBody}</dd>
              <dt className="text-ink-muted">Certificate</dt>
              <dd className="num">{supervisor.designation.certificateNumber}</dd>
              <dt className="text-ink-muted">Statement</dt>
              <dd>
                {supervisor.signature ? (
                  <span className="font-semibold text-ok">Signed {when(supervisor.signature.signedAt)}</span>
                ) : (
                  <span className="font-semibold text-caution">Not signed yet</span>
                )}
              </dd>
            </dl>
          ) : (
            <p className="mb-4 font-semibold">No TAB supervisor designated yet.</p>
          )}
          {supervisor.statement && <blockquote className="mb-4 border-l-4 border-line-strong bg-paper p-3 italic">{supervisor.statement}</blockquote>}
          {isSupervisor && !supervisor.signature && <SignStatementForm projectId={projectId} />}
          {mayInvite && (
            <details className="mt-4" open={!supervisor.designation}>
              <summary className="min-h-touch cursor-pointer py-2 font-semibold">{supervisor.designation ? "Change the designation" : "Designate the TAB supervisor"}</summary>
              <div className="pt-2">
                <DesignateSupervisorForm
                  projectId={projectId}
                  technicians={technicians.map((t) => ({ userId: t.userId, name: t.name }))}
                  current={supervisor.designation && { userId: supervisor.designation.userId, certifyingBody: supervisor.designation.certifyingBody, certificateNumber: supervisor.designation.certificateNumber }}
                />
              </div>
            </details>
          )}
        </Card>
      </div>

      <div className="grid gap-gutter">
        {mayInvite && (
          <Card title="Invite someone">
            <InviteForm projectId={projectId} mayInviteEngineer={mayManage} />
          </Card>
        )}
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
      </div>
    </main>
  );
}
