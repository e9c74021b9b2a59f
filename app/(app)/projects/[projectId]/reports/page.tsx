import type { Metadata } from "next";
import Link from "next/link";
import { Card } from "@/components/ui/card";
import { Cautions } from "@/components/ui/caution";
import { NotAllowed } from "@/components/ui/not-allowed";
import { IssuedReports } from "@/components/reports/issued-reports";
import { ReportFlow } from "@/components/reports/report-flow";
import { can } from "@/lib/auth/policy";
import { getReportReadiness } from "@/lib/server/report-approvals";
import { readinessJson } from "@/lib/server/report-flow-http";
import { listReports } from "@/db/queries/reports";
import { loadAirflowScreen } from "@/lib/server/project-screen";

export const metadata: Metadata = { title: "Reports" };

export default async function ReportsPage({ params }: { params: Promise<{ projectId: string }> }) {
  const screen = await loadAirflowScreen(params, "report.download");
  if (!screen.allowed) return <NotAllowed what="downloading reports" />;
  const { systems } = screen;
  const sections = systems.flatMap((s) => s.sections);
  const approved = sections.filter((s) => s.latest?.status === "approved").length;
  const waiting = sections.filter((s) => s.latest?.status === "submitted").length;
  const unread = sections.filter((s) => !s.latest).length;
  const reports = await listReports({ projectId: screen.project.id });
  const readiness = readinessJson(await getReportReadiness({ projectId: screen.project.id }));
  const role = screen.access.role;

  return (
    <main className="mx-auto grid max-w-7xl items-start gap-gutter px-gutter py-6 lg:grid-cols-3">
      <Card title="Closeout reports" className="lg:col-span-2">
        {reports.length === 0 ? <p>No closeout report has been issued for this project yet.</p> : <IssuedReports projectId={screen.project.id} reports={reports} />}
        <p className="num mt-2 text-ink-soft">
          Readiness: {approved} of {sections.length} duct sections approved, {waiting} awaiting review, {unread} not yet traversed.
        </p>
      </Card>
      <Card title="Draft, approvals and issue" className="lg:col-span-2">
        <ReportFlow
          projectId={screen.project.id}
          readiness={readiness}
          role={role}
          canApprove={role !== null && can(screen.user, role, "report.approve")}
          canIssue={can(screen.user, role, "report.issue")}
        />
      </Card>
      <div className="grid gap-gutter lg:col-start-3 lg:row-span-2 lg:row-start-1">
        <Cautions title="Every report carries these cautions" />
        <p className="text-sm text-ink-soft">
          Anyone can check a copy of an issued report at{" "}
          <Link className="font-semibold text-accent-strong underline" href="/verify">
            /verify
          </Link>
          , or offline with the {/* A file, not a page. */}
          {/* eslint-disable-next-line @next/next/no-html-link-for-pages */}
          <a className="text-accent-strong underline" href="/api/v1/reports/public-key">
            public key
          </a>
          .
        </p>
      </div>
    </main>
  );
}
