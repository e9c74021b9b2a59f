import type { MemberRole } from "@/db/schema";
import { can, type Action, type Actor } from "@/lib/auth/policy";

export interface NavItem {
  href: string;
  label: string;
  /** Active only on its own path, not on the pages below it (the overview is the prefix of every tab). */
  exact: boolean;
}

const PROJECT_NAV: { path: string; label: string; action: Action }[] = [
  { path: "", label: "Overview", action: "project.view" },
  { path: "/setup", label: "Set-up", action: "design.edit" },
  { path: "/field", label: "Field work", action: "traverse.record" },
  { path: "/review", label: "Review", action: "traverse.review" },
  { path: "/systems", label: "Design vs measured", action: "design.edit" },
  { path: "/reports", label: "Reports", action: "report.download" },
  { path: "/members", label: "Members", action: "members.view" },
  { path: "/activity", label: "Activity", action: "audit.view" },
];

/** The project tabs a role sees: its own work. Hiding a link is cosmetic; every route checks again. */
export function projectNav(projectId: string, actor: Actor, role: MemberRole | null): NavItem[] {
  return PROJECT_NAV.filter((item) => can(actor, role, item.action)).map((item) => ({
    href: `/projects/${projectId}${item.path}`,
    label: item.label,
    exact: item.path === "",
  }));
}
