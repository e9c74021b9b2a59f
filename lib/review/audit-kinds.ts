/**
 * The audit feed's kinds of event, by action name, and each entry in plain words. Shared by the
 * audit route (its `kind` filter) and the Activity screen.
 */
import type { AuditKind } from "@/lib/validation/review";

/** LIKE patterns of the actions of each kind ("%" any text); "other" is everything none of these match. */
export const KIND_PATTERNS: Record<Exclude<AuditKind, "other">, readonly string[]> = {
  review: ["traverse.submitted", "traverse.resubmitted", "traverse.approved", "traverse.returned", "terminal_set.%", "system.approved", "system.returned", "sample.%"],
  field: ["traverse.started", "traverse.retraversed", "traverse.readings_saved", "traverse.changed", "terminal.reading_recorded", "conditions.%", "photo.%", "instrument.%"],
  design: ["project.created", "project.updated", "system.created", "system.updated", "system.deleted", "section.%", "terminal.created", "terminal.updated", "terminal.deleted", "design.%"],
  people: ["member.%", "invitation.%", "supervisor.%"],
  reports: ["report.%"],
  access: ["auth.%", "request.denied", "user.%"],
};

export const KIND_LABELS: Record<AuditKind, string> = {
  review: "Review and samples",
  field: "Field readings",
  design: "Design and settings",
  people: "People",
  reports: "Reports",
  access: "Sign-in and access",
  other: "Other",
};

function matches(action: string, pattern: string): boolean {
  return pattern.endsWith("%") ? action.startsWith(pattern.slice(0, -1)) : action === pattern;
}

export function kindOfAction(action: string): AuditKind {
  for (const [kind, patterns] of Object.entries(KIND_PATTERNS) as [Exclude<AuditKind, "other">, readonly string[]][]) if (patterns.some((p) => matches(action, p))) return kind;
  return "other";
}

const str = (v: unknown) => (typeof v === "string" ? v : typeof v === "number" ? String(v) : "");

/** One line saying what happened, from the action and what its entry recorded. */
export function describeAuditEntry(action: string, detail: Record<string, unknown>): string {
  const system = str(detail.systemTag);
  const section = str(detail.sectionTag);
  const rev = str(detail.revision);
  const where = [system, section].filter(Boolean).join(" / ");
  const comment = str(detail.comment);
  const withComment = comment ? `: “${comment}”` : "";
  switch (action) {
    case "traverse.started":
      return `Started a traverse of ${where || "a section"}`;
    case "traverse.retraversed":
      return `Started a re-traverse of ${where || "a section"} (revision ${rev}); the section is not approved until it is`;
    case "traverse.readings_saved":
      return `Saved readings of ${section || "a traverse"}${rev ? ` revision ${rev}` : ""} (${str(detail.changedPoints) || "0"} points changed)`;
    case "traverse.changed":
      return `Changed the set-up of ${section || "a traverse"}${rev ? ` revision ${rev}` : ""}`;
    case "traverse.submitted":
    case "traverse.resubmitted":
      return `${action === "traverse.resubmitted" ? "Resubmitted" : "Submitted"} the traverse of ${where} revision ${rev} for review`;
    case "traverse.approved":
      return `Approved the traverse of ${where} revision ${rev}${withComment}`;
    case "traverse.returned":
      return `Returned the traverse of ${where} revision ${rev}${withComment}`;
    case "terminal_set.submitted":
    case "terminal_set.resubmitted":
      return `${action === "terminal_set.resubmitted" ? "Resubmitted" : "Submitted"} the terminal readings of ${system} (set ${rev}) for review`;
    case "terminal_set.approved":
      return `Approved the terminal readings of ${system} (set ${rev})${withComment}`;
    case "terminal_set.returned":
      return `Returned the terminal readings of ${system} (set ${rev})${withComment}`;
    case "system.approved":
      return `Approved everything submitted in ${system}${withComment}`;
    case "system.returned":
      return `Returned everything submitted in ${system}${withComment}`;
    case "sample.drawn":
      return `Drew a verification sample of ${system} (seed ${str(detail.seed)}, ${Array.isArray(detail.items) ? detail.items.length : 0} items)`;
    case "sample.reading_recorded":
      return `Entered the agent's reading of ${str(detail.tag)} in the ${system} sample`;
    case "sample.witnessed":
      return `Changed the witnessed mark of ${str(detail.tag)} in the ${system} sample`;
    case "terminal.reading_recorded":
      return `Recorded a ${str(detail.phase)} reading of ${str(detail.terminalTag)} (${system})`;
    case "conditions.recorded":
      return `Recorded operating conditions of ${system || "a system"}`;
    case "request.denied":
      return "A request was refused";
    default:
      return action.replace(/[._]/g, " ");
  }
}
