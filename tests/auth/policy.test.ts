import { describe, expect, it } from "vitest";
import { ACTIONS, can, canKeepInstrumentRegister, POLICY } from "@/lib/auth/policy";
import { projectNav } from "@/lib/navigation";

const member = { isAdmin: false };
const admin = { isAdmin: true };

describe("role policy", () => {
  it("lets every member view the project and download reports", () => {
    for (const role of ["technician", "commissioning_agent", "engineer", "owner"] as const) {
      expect(can(member, role, "project.view")).toBe(true);
      expect(can(member, role, "report.download")).toBe(true);
    }
  });

  it("keeps each duty with its role", () => {
    expect(can(member, "technician", "traverse.record")).toBe(true);
    expect(can(member, "commissioning_agent", "traverse.record")).toBe(false);
    expect(can(member, "commissioning_agent", "traverse.review")).toBe(true);
    expect(can(member, "technician", "traverse.review")).toBe(false);
    expect(can(member, "engineer", "deviation.accept")).toBe(true);
    expect(can(member, "owner", "design.edit")).toBe(false);
    expect(can(member, "technician", "terminal.record")).toBe(true);
    expect(can(member, "owner", "terminal.record")).toBe(false);
    expect(can(member, "engineer", "project.edit")).toBe(true);
    expect(can(member, "engineer", "design.edit")).toBe(true);
    expect(can(member, "technician", "design.edit")).toBe(false);
    expect(can(member, "technician", "conditions.record")).toBe(true);
    for (const role of ["commissioning_agent", "engineer", "owner"] as const) expect(can(member, role, "conditions.record")).toBe(false);
    expect(can(admin, null, "conditions.record")).toBe(false);
  });

  it("keeps submission with technicians, decisions with commissioning agents, and the audit trail with those who answer for the results", () => {
    expect(can(member, "technician", "traverse.submit")).toBe(true);
    for (const role of ["commissioning_agent", "engineer", "owner"] as const) expect(can(member, role, "traverse.submit")).toBe(false);
    for (const role of ["technician", "engineer", "owner"] as const) expect(can(member, role, "traverse.review")).toBe(false);
    expect(can(admin, null, "traverse.submit")).toBe(false);
    expect(can(admin, null, "traverse.review")).toBe(false);
    expect(can(member, "commissioning_agent", "audit.view")).toBe(true);
    expect(can(member, "engineer", "audit.view")).toBe(true);
    expect(can(admin, null, "audit.view")).toBe(true);
    for (const role of ["technician", "owner"] as const) expect(can(member, role, "audit.view")).toBe(false);
  });

  it("lets technicians on any project and site administrators keep the instrument register", () => {
    expect(canKeepInstrumentRegister(member, ["owner", "technician"])).toBe(true);
    expect(canKeepInstrumentRegister(member, ["engineer", "commissioning_agent", "owner"])).toBe(false);
    expect(canKeepInstrumentRegister(member, [])).toBe(false);
    expect(canKeepInstrumentRegister(admin, [])).toBe(true);
  });

  it("lets every member read design against measured, owners included (their closeout report shows it), and only engineers change it", () => {
    for (const role of ["technician", "commissioning_agent", "engineer", "owner"] as const) expect(can(member, role, "design.view")).toBe(true);
    expect(POLICY["design.edit"]).toEqual(["engineer"]);
  });

  it("gives non-members nothing and site administrators set-up and oversight only", () => {
    for (const action of ACTIONS) expect(can(member, null, action)).toBe(false);
    expect(can(admin, null, "members.manage")).toBe(true);
    expect(can(admin, null, "project.view")).toBe(true);
    expect(can(admin, null, "traverse.record")).toBe(false);
    expect(can(admin, null, "traverse.review")).toBe(false);
    expect(can(admin, null, "terminal.record")).toBe(false);
    // Site administrators set projects up (settings and design), as engineers do.
    expect(can(admin, null, "project.edit")).toBe(true);
    expect(can(admin, null, "design.edit")).toBe(true);
    expect(POLICY["members.manage"]).toEqual([]);
  });

  it("shows each role its own work in the project navigation", () => {
    const labels = (role: Parameters<typeof projectNav>[2], actor = member) => projectNav("p", actor, role).map((i) => i.label);
    expect(labels("technician")).toEqual(["Overview", "Field work", "Reports", "Members"]);
    expect(labels("commissioning_agent")).toEqual(["Overview", "Review", "Reports", "Members", "Activity"]);
    expect(labels("engineer")).toEqual(["Overview", "Set-up", "Design vs measured", "Reports", "Members", "Activity"]);
    expect(labels("owner")).toEqual(["Overview", "Reports", "Members"]);
    expect(labels(null, admin)).toEqual(["Overview", "Set-up", "Design vs measured", "Reports", "Members", "Activity"]);
  });

  it("lets every member see who is on the project, and the engineer and site administrators manage people", () => {
    for (const role of ["technician", "commissioning_agent", "engineer", "owner"] as const) expect(can(member, role, "members.view")).toBe(true);
    expect(can(member, "engineer", "members.invite")).toBe(true);
    for (const role of ["technician", "commissioning_agent", "owner"] as const) expect(can(member, role, "members.invite")).toBe(false);
    expect(can(admin, null, "members.invite")).toBe(true);
    // Appointing engineers of record stays with site administrators.
    expect(can(member, "engineer", "members.manage")).toBe(false);
  });

  it("lets the commissioning agent and the engineer approve the report, them and site administrators issue it, and nobody else", () => {
    for (const role of ["commissioning_agent", "engineer"] as const) {
      expect(can(member, role, "report.approve")).toBe(true);
      expect(can(member, role, "report.issue")).toBe(true);
    }
    for (const role of ["technician", "owner"] as const) {
      expect(can(member, role, "report.approve")).toBe(false);
      expect(can(member, role, "report.issue")).toBe(false);
    }
    // Administrators issue on the approvals of others but approve nothing themselves.
    expect(can(admin, null, "report.issue")).toBe(true);
    expect(can(admin, null, "report.approve")).toBe(false);
  });

  it("lets only technicians attach photos and sign as TAB supervisor; administrators sign nothing", () => {
    expect(can(member, "technician", "photo.add")).toBe(true);
    expect(can(member, "engineer", "photo.add")).toBe(false);
    expect(can(member, "technician", "supervisor.sign")).toBe(true);
    expect(can(member, "engineer", "supervisor.sign")).toBe(false);
    expect(can(admin, null, "supervisor.sign")).toBe(false);
    expect(can(admin, null, "photo.add")).toBe(false);
  });
});
