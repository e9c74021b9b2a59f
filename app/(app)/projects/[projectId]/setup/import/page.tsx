import type { Metadata } from "next";
import Link from "next/link";
import { ScheduleImport } from "@/components/setup/schedule-import";
import { Card } from "@/components/ui/card";
import { NotAllowed } from "@/components/ui/not-allowed";
import { requireProjectPage } from "@/lib/auth/guards";
import { PLAIN_COLUMNS, QUANTITY_COLUMNS, SCHEDULE_LIMITS, unitSuffixes } from "@/lib/design/schedule-csv";

export const metadata: Metadata = { title: "Import a design schedule" };

const APPLIES = { both: "both", section: "sections", terminal: "terminals" } as const;

export default async function ImportSchedulePage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const page = await requireProjectPage(projectId, "design.edit");
  if (!page.allowed) return <NotAllowed what="setting the project up" />;
  const { project } = page.access;
  const columns = [
    ...PLAIN_COLUMNS.map((c) => ({ name: c.name, applies: c.applies, description: c.description })),
    ...QUANTITY_COLUMNS.map((c) => ({ name: unitSuffixes(c.quantity).map((s) => `${c.name}_${s}`).join(" "), applies: c.applies, description: c.description })),
  ];
  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <nav aria-label="Breadcrumb" className="text-sm">
        <Link href={`/projects/${project.id}/setup`} className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline-offset-4 hover:underline">
          ← Set-up
        </Link>
      </nav>
      <Card title="Import a design schedule">
        <p className="mb-4 text-ink-soft">
          One CSV of duct sections and terminals, one line each. Tags already in a system are updated, new tags are added, and nothing is deleted. A column the file
          leaves out keeps what the project has; an empty cell clears an optional value. The air systems must exist first. At most {SCHEDULE_LIMITS.maxRows.toLocaleString("en-US")} lines and 1 MiB; save from a spreadsheet as “CSV UTF-8”.
        </p>
        <ScheduleImport projectId={project.id} />
      </Card>
      <Card title="Columns">
        <p className="mb-3 text-ink-soft">
          Headers may be in any case and order. Every quantity names its unit in the header, so a schedule in cfm and inches imports as it is. Start from an export to
          get the columns right:{" "}
          <a href={`/api/v1/projects/${project.id}/design/export.csv?units=IP`} className="font-semibold text-accent-strong underline underline-offset-4" download>
            export in cfm and inches
          </a>{" "}
          or{" "}
          <a href={`/api/v1/projects/${project.id}/design/export.csv?units=SI`} className="font-semibold text-accent-strong underline underline-offset-4" download>
            in L/s and millimetres
          </a>
          .
        </p>
        <div className="overflow-x-auto">
          <table className="w-full text-left">
            <thead className="border-b-2 border-line text-sm text-ink-muted">
              <tr>
                <th className="py-2 pr-3">Column</th>
                <th className="py-2 pr-3">Rows</th>
                <th className="py-2">Meaning</th>
              </tr>
            </thead>
            <tbody>
              {columns.map((c) => (
                <tr key={c.name} className="border-b border-line align-top">
                  <td className="py-1 pr-3">
                    <span className="flex flex-col">
                      {c.name.split(" ").map((n) => (
                        <code key={n}>{n}</code>
                      ))}
                    </span>
                  </td>
                  <td className="py-1 pr-3">{APPLIES[c.applies]}</td>
                  <td className="py-1">{c.description.replace(/`/g, "")}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>
    </main>
  );
}
