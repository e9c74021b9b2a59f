"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import type { Project } from "@/db/schema";
import { EditProjectForm } from "./project-settings-form";

/** The project's settings as read, with an "Edit settings" button that opens the form in place. */
export function ProjectSettings({ project, units, children }: { project: Project; units: "IP" | "SI"; children: React.ReactNode }) {
  const [editing, setEditing] = useState(false);
  if (editing) return <EditProjectForm project={project} units={units} onDone={() => setEditing(false)} />;
  return (
    <div className="space-y-3">
      {children}
      <Button variant="secondary" onClick={() => setEditing(true)}>
        Edit settings
      </Button>
    </div>
  );
}
