import type { Metadata } from "next";
import Link from "next/link";
import { buttonClasses } from "@/components/ui/button";
import { EmptyState } from "@/components/ui/card";
import { listProjectsForUser } from "@/db/queries/projects";
import { requireUser } from "@/lib/auth/guards";
import { ROLE_LABELS } from "@/lib/auth/policy";
import { mayCreateProject } from "@/lib/server/design";

export const metadata: Metadata = { title: "Projects" };

export default async function ProjectsPage() {
  const user = await requireUser();
  const [projects, mayCreate] = await Promise.all([listProjectsForUser({ userId: user.id, isAdmin: user.isAdmin }), mayCreateProject(user)]);
  return (
    <main className="mx-auto max-w-7xl px-gutter py-6">
      <div className="mb-5 flex flex-wrap items-center justify-between gap-3">
        <h1>Projects</h1>
        {mayCreate && (
          <Link href="/projects/new" className={buttonClasses("primary")}>
            New project
          </Link>
        )}
      </div>
      {projects.length === 0 ? (
        <EmptyState>
          {mayCreate ? "No projects yet. Start one with New project." : "You are not a member of any project yet. Ask your project administrator to add you."}
        </EmptyState>
      ) : (
        <ul className="grid gap-4 md:grid-cols-2">
          {projects.map((p) => {
            const pct = p.sectionCount === 0 ? 0 : Math.round((100 * p.approvedSectionCount) / p.sectionCount);
            return (
              <li key={p.id}>
                <Link
                  href={`/projects/${p.id}`}
                  className="block rounded-card border border-line bg-paper-raised p-gutter shadow-sm hover:border-accent"
                >
                  <div className="flex flex-wrap items-baseline justify-between gap-2">
                    <h2 className="text-lg">{p.name}</h2>
                    <span className="rounded-full bg-accent-soft px-3 py-0.5 text-sm font-semibold text-accent-strong">
                      {p.role ? ROLE_LABELS[p.role] : "Site administrator"}
                    </span>
                  </div>
                  <p className="text-ink-soft">{p.siteName}</p>
                  <div className="mt-3" aria-label={`${p.approvedSectionCount} of ${p.sectionCount} duct sections approved`}>
                    <div className="h-2 overflow-hidden rounded-full bg-paper-sunk">
                      <div className="h-full bg-ok" style={{ width: `${pct}%` }} />
                    </div>
                    <p className="num mt-1 text-sm text-ink-soft">
                      {p.approvedSectionCount} of {p.sectionCount} duct sections approved · {p.submittedTraverseCount} awaiting review ·{" "}
                      {p.systemCount} air systems · {p.unitSystem === "IP" ? "inch-pound" : "SI"} units
                    </p>
                  </div>
                </Link>
              </li>
            );
          })}
        </ul>
      )}
    </main>
  );
}
