import type { Metadata } from "next";
import { NewProjectForm } from "@/components/setup/project-settings-form";
import { Card } from "@/components/ui/card";
import { requireUser } from "@/lib/auth/guards";
import { mayCreateProject } from "@/lib/server/design";

export const metadata: Metadata = { title: "New project" };

export default async function NewProjectPage() {
  const user = await requireUser();
  if (!(await mayCreateProject(user)))
    return (
      <main className="mx-auto max-w-7xl px-gutter py-6">
        <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft p-4 font-semibold text-fault">
          Only site administrators and project engineers can start a project. Ask your site administrator to start it and add you.
        </p>
      </main>
    );
  return (
    <main className="mx-auto max-w-4xl px-gutter py-6">
      <h1 className="mb-2">New project</h1>
      <p className="mb-4 text-ink-soft">You become the project&apos;s engineer. Add its air systems and duct trees next, by form or from a design schedule file.</p>
      <Card>
        <NewProjectForm userUnits={user.unitSystem} />
      </Card>
    </main>
  );
}
