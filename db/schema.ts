import { sql } from "drizzle-orm";
import {
  type AnyPgColumn,
  bigserial,
  boolean,
  check,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";

// All physical quantities are stored in SI: mm for duct dimensions, m³/s for flows,
// Pa for pressures, °C for temperatures, kg/m³ for densities. Conversion happens at the edges.

export const memberRole = pgEnum("member_role", ["technician", "commissioning_agent", "engineer", "owner"]);
export const unitSystem = pgEnum("unit_system", ["IP", "SI"]);
export const systemKind = pgEnum("system_kind", ["supply", "return", "exhaust", "outside_air"]);
export const sectionKind = pgEnum("section_kind", ["trunk", "branch"]);
export const ductShape = pgEnum("duct_shape", ["round", "rectangular"]);
export const terminalKind = pgEnum("terminal_kind", ["supply", "return", "exhaust"]);
export const traverseMethod = pgEnum("traverse_method", ["equal-area", "log-linear"]);
export const readingsKind = pgEnum("readings_kind", ["velocity_pressure", "velocity_actual", "velocity_standard"]);
export const traverseStatus = pgEnum("traverse_status", ["draft", "submitted", "approved", "returned"]);
export const reviewDecision = pgEnum("review_decision", ["approved", "returned"]);
export const readingPhase = pgEnum("reading_phase", ["as_found", "as_left"]);

export type MemberRole = (typeof memberRole.enumValues)[number];
export type UnitSystem = (typeof unitSystem.enumValues)[number];
export type TraverseStatus = (typeof traverseStatus.enumValues)[number];
export type TraverseMethod = (typeof traverseMethod.enumValues)[number];
export type DuctShape = (typeof ductShape.enumValues)[number];

const createdAt = () => timestamp("created_at", { withTimezone: true }).notNull().defaultNow();

export const users = pgTable(
  "users",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    email: text("email").notNull(),
    name: text("name").notNull(),
    passwordHash: text("password_hash").notNull(),
    isAdmin: boolean("is_admin").notNull().default(false),
    unitSystem: unitSystem("unit_system"),
    /**
     * Sealed into every session cookie at sign-in and compared on each request (read with the user, no
     * extra query): raising it ends every session of the user at once (sign out everywhere, new password).
     */
    sessionVersion: integer("session_version").notNull().default(1),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("users_email_lower_idx").on(sql`lower(${t.email})`)],
);

export const projects = pgTable(
  "projects",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    name: text("name").notNull(),
    siteName: text("site_name").notNull(),
    address: text("address").notNull().default(""),
    altitudeM: doublePrecision("altitude_m").notNull().default(0),
    unitSystem: unitSystem("unit_system").notNull().default("SI"),
    standardDensityKgM3: doublePrecision("standard_density_kg_m3").notNull().default(1.204),
    terminalTolerancePct: doublePrecision("terminal_tolerance_pct").notNull().default(10),
    sectionTolerancePct: doublePrecision("section_tolerance_pct").notNull().default(10),
    fanTolerancePct: doublePrecision("fan_tolerance_pct").notNull().default(5),
    continuityTolerancePct: doublePrecision("continuity_tolerance_pct").notNull().default(10),
    createdAt: createdAt(),
  },
  (t) => [
    check("projects_density_range", sql`${t.standardDensityKgM3} between 0.5 and 2`),
    check("projects_altitude_range", sql`${t.altitudeM} between -500 and 5000`),
  ],
);

export const projectMembers = pgTable(
  "project_members",
  {
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    userId: uuid("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: memberRole("role").notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.projectId, t.userId] }), index("project_members_user_idx").on(t.userId)],
);

/** An air handler or fan with the airflow it was designed to deliver. */
export const airSystems = pgTable(
  "air_systems",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    tag: text("tag").notNull(),
    name: text("name").notNull(),
    kind: systemKind("kind").notNull(),
    designFlowM3S: doublePrecision("design_flow_m3_s").notNull(),
    designStaticPa: doublePrecision("design_static_pa"),
    fanSpeedRpm: doublePrecision("fan_speed_rpm"),
    location: text("location").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("air_systems_project_tag_idx").on(t.projectId, t.tag)],
);

/** A duct section: trunk or branch, forming a tree through parentId. */
export const ductSections = pgTable(
  "duct_sections",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    systemId: uuid("system_id")
      .notNull()
      .references(() => airSystems.id, { onDelete: "cascade" }),
    parentId: uuid("parent_id").references((): AnyPgColumn => ductSections.id, { onDelete: "cascade" }),
    tag: text("tag").notNull(),
    kind: sectionKind("kind").notNull(),
    shape: ductShape("shape").notNull(),
    diameterMm: doublePrecision("diameter_mm"),
    widthMm: doublePrecision("width_mm"),
    heightMm: doublePrecision("height_mm"),
    designFlowM3S: doublePrecision("design_flow_m3_s").notNull(),
    straightUpstreamMm: doublePrecision("straight_upstream_mm"),
    straightDownstreamMm: doublePrecision("straight_downstream_mm"),
    location: text("location").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("duct_sections_system_tag_idx").on(t.systemId, t.tag),
    index("duct_sections_parent_idx").on(t.parentId),
    check(
      "duct_sections_dimensions",
      // coalesce: a NULL comparison would make the whole check NULL, which PostgreSQL counts as passing.
      sql`(${t.shape} = 'round' and coalesce(${t.diameterMm}, 0) > 0) or (${t.shape} = 'rectangular' and coalesce(${t.widthMm}, 0) > 0 and coalesce(${t.heightMm}, 0) > 0)`,
    ),
  ],
);

/** A supply, return or exhaust device fed by a duct section. */
export const terminals = pgTable(
  "terminals",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    sectionId: uuid("section_id")
      .notNull()
      .references(() => ductSections.id, { onDelete: "cascade" }),
    tag: text("tag").notNull(),
    kind: terminalKind("kind").notNull(),
    device: text("device").notNull().default(""),
    room: text("room").notNull().default(""),
    designFlowM3S: doublePrecision("design_flow_m3_s").notNull(),
    effectiveAreaM2: doublePrecision("effective_area_m2"),
    createdAt: createdAt(),
  },
  (t) => [index("terminals_section_idx").on(t.sectionId)],
);

export const terminalReadings = pgTable(
  "terminal_readings",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    terminalId: uuid("terminal_id")
      .notNull()
      .references(() => terminals.id, { onDelete: "cascade" }),
    phase: readingPhase("phase").notNull(),
    flowM3S: doublePrecision("flow_m3_s").notNull(),
    instrument: text("instrument").notNull().default(""),
    takenBy: uuid("taken_by").references(() => users.id, { onDelete: "set null" }),
    takenAt: timestamp("taken_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("terminal_readings_terminal_idx").on(t.terminalId)],
);

/** A pitot or anemometer traverse across one duct section, with the air conditions at the plane. */
export const traverses = pgTable(
  "traverses",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    sectionId: uuid("section_id")
      .notNull()
      .references(() => ductSections.id, { onDelete: "cascade" }),
    method: traverseMethod("method").notNull(),
    lines: integer("lines").notNull(),
    pointsPerLine: integer("points_per_line").notNull(),
    readingsKind: readingsKind("readings_kind").notNull().default("velocity_pressure"),
    instrument: text("instrument").notNull().default(""),
    instrumentSerial: text("instrument_serial").notNull().default(""),
    probeCoefficient: doublePrecision("probe_coefficient").notNull().default(1),
    dryBulbC: doublePrecision("dry_bulb_c"),
    wetBulbC: doublePrecision("wet_bulb_c"),
    relativeHumidityPct: doublePrecision("relative_humidity_pct"),
    barometricPa: doublePrecision("barometric_pa"),
    staticPa: doublePrecision("static_pa"),
    portOffsetMm: doublePrecision("port_offset_mm").notNull().default(0),
    status: traverseStatus("status").notNull().default("draft"),
    version: integer("version").notNull().default(1),
    notes: text("notes").notNull().default(""),
    takenBy: uuid("taken_by").references(() => users.id, { onDelete: "set null" }),
    takenAt: timestamp("taken_at", { withTimezone: true }),
    submittedAt: timestamp("submitted_at", { withTimezone: true }),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("traverses_section_idx").on(t.sectionId),
    check("traverses_counts", sql`${t.lines} >= 1 and ${t.pointsPerLine} >= 2`),
  ],
);

/** One point of a traverse: velocity pressure (Pa) or velocity (m/s), per the traverse's readingsKind. */
export const readings = pgTable(
  "readings",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    traverseId: uuid("traverse_id")
      .notNull()
      .references(() => traverses.id, { onDelete: "cascade" }),
    line: integer("line").notNull(),
    point: integer("point").notNull(),
    value: doublePrecision("value").notNull(),
    recordedAt: timestamp("recorded_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("readings_position_idx").on(t.traverseId, t.line, t.point)],
);

/** A commissioning agent's decision on one version of a traverse. */
export const reviews = pgTable(
  "reviews",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    traverseId: uuid("traverse_id")
      .notNull()
      .references(() => traverses.id, { onDelete: "cascade" }),
    reviewerId: uuid("reviewer_id")
      .notNull()
      .references(() => users.id),
    decision: reviewDecision("decision").notNull(),
    reason: text("reason").notNull().default(""),
    witnessed: boolean("witnessed").notNull().default(false),
    traverseVersion: integer("traverse_version").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("reviews_traverse_idx").on(t.traverseId)],
);

/**
 * Append-only record of who did what, and of requests that were refused. A database trigger refuses
 * UPDATE, DELETE and TRUNCATE. The user and project ids carry no foreign key on purpose: deleting a
 * user or a project must neither delete nor rewrite its history, and the actor's e-mail is copied
 * as it was at the time.
 */
export const auditLog = pgTable(
  "audit_log",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
    userId: uuid("user_id"),
    actorEmail: text("actor_email"),
    projectId: uuid("project_id"),
    action: text("action").notNull(),
    entityType: text("entity_type").notNull(),
    entityId: text("entity_id"),
    detail: jsonb("detail").$type<Record<string, unknown>>().notNull().default({}),
  },
  (t) => [index("audit_log_project_idx").on(t.projectId, t.at), index("audit_log_action_idx").on(t.action, t.at)],
);

/** pending: being checked; cleared: a failure forgiven by a later success from the same address. */
export const signInOutcome = pgEnum("sign_in_outcome", ["pending", "failed", "succeeded", "throttled", "cleared"]);
export type SignInOutcome = (typeof signInOutcome.enumValues)[number];

/**
 * Every sign-in attempt, recorded before the password is checked so that parallel guesses count
 * against each other. Keyed by the e-mail as typed (lower case, whether or not an account has it)
 * and by the client address; rows older than a day are pruned.
 */
export const signInAttempts = pgTable(
  "sign_in_attempts",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
    email: text("email").notNull(),
    client: text("client").notNull(),
    outcome: signInOutcome("outcome").notNull().default("pending"),
  },
  (t) => [index("sign_in_attempts_email_idx").on(t.email, t.at), index("sign_in_attempts_client_idx").on(t.client, t.at), index("sign_in_attempts_at_idx").on(t.at)],
);

export type User = typeof users.$inferSelect;
export type Project = typeof projects.$inferSelect;
export type AirSystem = typeof airSystems.$inferSelect;
export type DuctSection = typeof ductSections.$inferSelect;
export type Terminal = typeof terminals.$inferSelect;
export type Traverse = typeof traverses.$inferSelect;
export type Reading = typeof readings.$inferSelect;
export type Review = typeof reviews.$inferSelect;
