import "server-only";
import { NextResponse } from "next/server";
import type { Readiness } from "./report-approvals";
import { ReportFlowError } from "./report-approvals";
import { jsonError } from "./route";

/** Runs a report-flow action and turns its refusals into the API's error answers (409s list the blockers). */
export async function answerReportFlow(work: () => Promise<Response>): Promise<Response> {
  try {
    return await work();
  } catch (err) {
    if (!(err instanceof ReportFlowError)) throw err;
    if (err.blockers && err.blockers.length > 0) {
      return NextResponse.json({ error: { message: `${err.message} ${err.blockers.join(" ")}` }, blockers: err.blockers }, { status: err.status, headers: { "cache-control": "no-store" } });
    }
    return jsonError(err.status, err.message, err.fields);
  }
}

/** Readiness as the API answers it (`GET …/reports/readiness`, and after an approval). */
export function readinessJson(r: Readiness) {
  return {
    ready: r.ready,
    revision: r.revision,
    blockers: r.blockers,
    excluded: r.excluded,
    approvals: r.approvals.map((a) => ({ role: a.role, title: a.title, approval: a.approval, current: a.current })),
    supervisor: r.supervisor,
    fingerprint: r.fingerprint,
  };
}
