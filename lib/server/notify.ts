/**
 * Tells people what needs them: an in-app notice per recipient (the bell in the header, /notifications)
 * and an e-mail through the outbox or SMTP (lib/server/mailer.ts). Everything is written in the
 * caller's transaction when one is given, so a rolled-back decision notifies no one, and mail is sent
 * after the commit by the delivery worker: a slow mail server never fails or delays the caller.
 *
 * The review workflow calls the typed helpers below; `notify` is the general form.
 */
import { and, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { notifications, projectMembers, projects, users, type MemberRole, type NotificationKind } from "@/db/schema";
import { renderMail, type MailContent } from "./mail-render";
import { kickDelivery, queueMail, type DbOrTx } from "./mailer";
import { publicUrl } from "./public-url";

/** A generous bound on one notice's recipients. */
export const MAX_RECIPIENTS = 500;

export interface NotifyInput {
  projectId: string | null;
  /** Members holding these roles in the project, and these users; each person is told once. */
  to: { roles?: readonly MemberRole[]; userIds?: readonly string[] };
  /** People not to tell (usually the one who acted). */
  except?: readonly string[];
  kind: NotificationKind;
  /** One line: the in-app notice and the e-mail's subject. */
  subject: string;
  /** The e-mail's body. */
  mail: MailContent;
  /** Where to look, as an app path ("/projects/…"); e-mails carry it as an absolute URL. */
  link: string;
  /** The caller's transaction; without one, the notice is written in its own. */
  tx?: DbOrTx;
  /** False: in-app only. */
  email?: boolean;
}

export interface Recipient {
  id: string;
  email: string;
  name: string;
}

async function recipients(db: DbOrTx, input: NotifyInput): Promise<Recipient[]> {
  const found = new Map<string, Recipient>();
  const columns = { id: users.id, email: users.email, name: users.name };
  if (input.projectId && input.to.roles?.length) {
    const rows = await db
      .select(columns)
      .from(projectMembers)
      .innerJoin(users, eq(users.id, projectMembers.userId))
      .where(and(eq(projectMembers.projectId, input.projectId), inArray(projectMembers.role, [...input.to.roles])))
      .limit(MAX_RECIPIENTS);
    for (const r of rows) found.set(r.id, r);
  }
  if (input.to.userIds?.length) {
    const rows = await db.select(columns).from(users).where(inArray(users.id, [...input.to.userIds].slice(0, MAX_RECIPIENTS)));
    for (const r of rows) found.set(r.id, r);
  }
  for (const id of input.except ?? []) found.delete(id);
  return [...found.values()].slice(0, MAX_RECIPIENTS);
}

/** Writes an in-app notice and an e-mail for each recipient; returns who was told. */
export async function notify(input: NotifyInput): Promise<Recipient[]> {
  const write = async (db: DbOrTx) => {
    const people = await recipients(db, input);
    if (people.length === 0) return people;
    await db.insert(notifications).values(people.map((p) => ({ userId: p.id, projectId: input.projectId, kind: input.kind, message: input.subject.slice(0, 300), link: input.link })));
    if (input.email !== false) {
      const { text, html } = renderMail({ ...input.mail, greeting: input.mail.greeting });
      await queueMail(
        db,
        people.map((p) => ({ to: p.email, toName: p.name, subject: input.subject, text: text.replace("{name}", () => p.name), html: html.replace("{name}", () => escapeName(p.name)), kind: input.kind, projectId: input.projectId })),
      );
    }
    return people;
  };
  const people = input.tx ? await write(input.tx) : await (await getDb()).transaction((tx) => write(tx));
  kickDelivery();
  return people;
}

function escapeName(name: string): string {
  return name.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}

async function projectName(db: DbOrTx, projectId: string): Promise<string> {
  const [row] = await db.select({ name: projects.name }).from(projects).where(eq(projects.id, projectId));
  return row?.name ?? "your project";
}

// ── Typed helpers for the workflow ──────────────────────────────────────────────────────────────────

/** What was submitted or decided: a traverse or a system's terminal readings, named for people. */
export interface ReviewItem {
  type: "traverse" | "terminal_set";
  id: string;
  /** E.g. "traverse of AHU-1 / S1.2 (revision 2)" or "terminal readings of AHU-1". */
  label: string;
}

interface Actor {
  id: string;
  name: string;
}

const ITEM_KIND = {
  traverse: { submitted: "traverse.submitted", returned: "traverse.returned", approved: "traverse.approved" },
  terminal_set: { submitted: "terminal_set.submitted", returned: "terminal_set.returned", approved: "terminal_set.approved" },
} as const satisfies Record<ReviewItem["type"], Record<string, NotificationKind>>;

/** Submission: the project's commissioning agents are asked to review. */
export async function notifySubmitted({ projectId, item, by, tx }: { projectId: string; item: ReviewItem; by: Actor; tx?: DbOrTx }) {
  const db = tx ?? (await getDb());
  const name = await projectName(db, projectId);
  const link = `/projects/${projectId}/review`;
  return notify({
    projectId,
    to: { roles: ["commissioning_agent"] },
    except: [by.id],
    kind: ITEM_KIND[item.type].submitted,
    subject: `${name}: ${item.label} submitted for review`,
    mail: {
      greeting: "Hello {name},",
      paragraphs: [`${by.name} submitted the ${item.label} on ${name}. It is waiting for your review.`],
      action: { label: "Open the review queue", url: publicUrl(link) },
    },
    link,
    tx,
  });
}

/** Return: the technician who took the readings gets the reviewer's comment. */
export async function notifyReturned({
  projectId,
  item,
  technicianUserId,
  by,
  comment,
  tx,
}: {
  projectId: string;
  item: ReviewItem;
  technicianUserId: string;
  by: Actor;
  comment: string;
  tx?: DbOrTx;
}) {
  const db = tx ?? (await getDb());
  const name = await projectName(db, projectId);
  const link = `/projects/${projectId}/field`;
  return notify({
    projectId,
    to: { userIds: [technicianUserId] },
    kind: ITEM_KIND[item.type].returned,
    subject: `${name}: ${item.label} returned — ${comment.replace(/\s+/g, " ").slice(0, 120)}`,
    mail: {
      greeting: "Hello {name},",
      paragraphs: [`${by.name} returned the ${item.label} on ${name}. It is open for you to correct and submit again.`],
      quote: { by: by.name, text: comment },
      action: { label: "Open field work", url: publicUrl(link) },
    },
    link,
    tx,
  });
}

/** Approval: the engineer of record and the owner are told. */
export async function notifyApproved({ projectId, item, by, tx }: { projectId: string; item: ReviewItem; by: Actor; tx?: DbOrTx }) {
  const db = tx ?? (await getDb());
  const name = await projectName(db, projectId);
  const link = `/projects/${projectId}`;
  return notify({
    projectId,
    to: { roles: ["engineer", "owner"] },
    except: [by.id],
    kind: ITEM_KIND[item.type].approved,
    subject: `${name}: ${item.label} approved`,
    mail: {
      greeting: "Hello {name},",
      paragraphs: [`${by.name} approved the ${item.label} on ${name}.`],
      action: { label: "Open the project", url: publicUrl(link) },
    },
    link,
    tx,
  });
}

/** Report issue: the owner gets the download link and the verification link. */
export async function notifyReportIssued({
  projectId,
  reportId,
  revision,
  code,
  by,
  tx,
}: {
  projectId: string;
  reportId: string;
  revision: number;
  code: string;
  by: Actor;
  tx?: DbOrTx;
}) {
  const db = tx ?? (await getDb());
  const name = await projectName(db, projectId);
  const link = `/projects/${projectId}/reports`;
  return notify({
    projectId,
    to: { roles: ["owner"] },
    except: [by.id],
    kind: "report.issued",
    subject: `${name}: closeout report revision ${revision} issued`,
    mail: {
      greeting: "Hello {name},",
      paragraphs: [
        `${by.name} issued revision ${revision} of the closeout report for ${name}. Signed in, you can download it from the project's Reports page or with the link below.`,
        `Anyone can check that a copy is genuine at ${publicUrl(`/verify/${code}`)} (verification code ${code}).`,
      ],
      action: { label: "Download the report (PDF)", url: publicUrl(`/api/v1/projects/${projectId}/reports/${reportId}/pdf`) },
    },
    link,
    tx,
  });
}
