import { ProjectNav } from "@/components/layout/project-nav";
import { requireProjectPage } from "@/lib/auth/guards";
import { ROLE_LABELS } from "@/lib/auth/policy";
import { projectNav } from "@/lib/navigation";

export default async function ProjectLayout({ children, params }: { children: React.ReactNode; params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, access } = await requireProjectPage(projectId, "project.view");
  const { project, role } = access;
  return (
    <>
      <div className="border-b border-line bg-paper-raised">
        <div className="mx-auto flex max-w-7xl flex-wrap items-end justify-between gap-2 px-gutter pt-4 pb-2">
          <div>
            <p className="text-sm font-semibold uppercase tracking-wide text-ink-muted">{project.siteName}</p>
            <h1>{project.name}</h1>
          </div>
          <p className="text-sm text-ink-soft">
            Your role: <strong className="text-ink">{role ? ROLE_LABELS[role] : "Site administrator"}</strong>
          </p>
        </div>
      </div>
      <ProjectNav items={projectNav(project.id, user, role)} />
      {children}
    </>
  );
}
