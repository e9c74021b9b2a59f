import type { Metadata } from "next";
import { AcceptedDeviationsNote } from "@/components/engineer/accepted-deviations-note";
import { listDeviations } from "@/db/queries/deviations";
import { listConditionsForSystem } from "@/db/queries/conditions";
import { ReviewQueue } from "@/components/review/review-queue";
import { SamplePanel, type SampleSystem } from "@/components/review/sample-panel";
import { NotAllowed } from "@/components/ui/not-allowed";
import type { QueueJson, Sample } from "@/lib/api-client/review";
import { requireProjectPage } from "@/lib/auth/guards";
import { reviewQueue } from "@/lib/server/review-queue";
import { listVerificationSamples } from "@/lib/server/verification";
import { unitSystemFor } from "@/lib/units";

export const metadata: Metadata = { title: "Review" };

/** Server values as the client receives them over the API (dates as ISO text). */
const asJson = <T,>(value: unknown): T => JSON.parse(JSON.stringify(value)) as T;

export default async function ReviewPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const { user, access, allowed } = await requireProjectPage(projectId, "traverse.review");
  if (!allowed) return <NotAllowed what="reviewing readings" />;
  const { project } = access;
  const units = unitSystemFor(user, project);
  const [queue, samples, deviations] = await Promise.all([reviewQueue(project), listVerificationSamples(project, null), listDeviations({ projectId: project.id })]);
  const systems: SampleSystem[] = await Promise.all(
    queue.systems.map(async (s) => ({
      ...s,
      submitted: queue.items.filter((i) => i.systemId === s.id && i.status === "submitted").length,
      conditions: asJson<SampleSystem["conditions"]>(await listConditionsForSystem({ systemId: s.id })),
    })),
  );

  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <section aria-labelledby="queue-heading" className="grid gap-3">
        <h2 id="queue-heading">Review queue</h2>
        <p className="text-ink-soft">Approve or return each submitted traverse and each system&apos;s terminal readings; a return goes back to the technician with your comment. Approved readings are locked; a re-traverse starts a new revision that needs its own approval.</p>
        <AcceptedDeviationsNote deviations={deviations} />
        <ReviewQueue projectId={project.id} initial={asJson<QueueJson>(queue)} units={units} canDecide />
      </section>
      <section aria-labelledby="samples-heading" className="grid gap-3">
        <h2 id="samples-heading">Verification samples</h2>
        <SamplePanel
          projectId={project.id}
          systems={systems}
          initial={asJson<Sample[]>((samples.body as { samples: unknown }).samples)}
          units={units}
          rule={{ samplePct: project.samplePct, minCount: project.sampleMinCount, tolerancePct: project.sampleTolerancePct, allowedFailures: project.sampleAllowedFailures }}
          canAct
        />
      </section>
    </main>
  );
}
