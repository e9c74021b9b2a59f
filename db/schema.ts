import { sql } from "drizzle-orm";
import {
  type AnyPgColumn,
  bigint,
  bigserial,
  boolean,
  check,
  date,
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
import type { InstrumentAccuracy } from "@/lib/airflow/uncertainty";

// All physical quantities are stored in SI: mm for duct dimensions, m³/s for flows,
// Pa for pressures, °C for temperatures, kg/m³ for densities. Conversion happens at the edges.

export const memberRole = pgEnum("member_role", ["technician", "commissioning_agent", "engineer", "owner"]);
export const unitSystem = pgEnum("unit_system", ["IP", "SI"]);
export const systemKind = pgEnum("system_kind", ["supply", "return", "exhaust", "outside_air"]);
export const sectionKind = pgEnum("section_kind", ["trunk", "branch"]);
export const ductShape = pgEnum("duct_shape", ["round", "rectangular"]);
export const traverseMethod = pgEnum("traverse_method", ["equal-area", "log-linear"]);
export const readingsKind = pgEnum("readings_kind", ["velocity_pressure", "velocity_actual", "velocity_standard"]);
export const traverseStatus = pgEnum("traverse_status", ["draft", "submitted", "approved", "returned"]);
export const reviewDecision = pgEnum("review_decision", ["approved", "returned"]);
/** Which way the air goes through a terminal. */
export const airService = pgEnum("air_service", ["supply", "return", "exhaust", "outside_air"]);
/** Air outlets and inlets (diffuser, grille, register) and terminal units (VAV or constant-volume box). */
export const terminalType = pgEnum("terminal_type", ["diffuser", "grille", "register", "vav_box", "constant_volume_box"]);
export const terminalReadingPhase = pgEnum("terminal_reading_phase", ["initial", "final"]);
export const terminalReadingMethod = pgEnum("terminal_reading_method", ["hood", "velocity_area", "traverse"]);
/** The operating point a terminal was read at: outlets at their design setting, terminal units forced to a setpoint. */
export const terminalSetpoint = pgEnum("terminal_setpoint", ["design", "maximum", "minimum", "heating"]);
/** Anemometer velocities at an outlet: at the air's own density, or referred to standard density. */
export const velocityBasis = pgEnum("velocity_basis", ["actual", "standard"]);
export const instrumentKind = pgEnum("instrument_kind", [
  "manometer",
  "pitot_tube",
  "capture_hood",
  "thermal_anemometer",
  "vane_anemometer",
  "tachometer",
  "clamp_meter",
  "thermo_hygrometer",
  "barometer",
]);
/** Terminal units held at one setpoint for the readings (or left to their controls: "none"). */
export const boxOverride = pgEnum("box_override", ["none", "maximum", "minimum", "mixed"]);
export const filterState = pgEnum("filter_state", ["clean", "part_loaded", "loaded", "unknown"]);

export type MemberRole = (typeof memberRole.enumValues)[number];
export type UnitSystem = (typeof unitSystem.enumValues)[number];
export type TraverseStatus = (typeof traverseStatus.enumValues)[number];
export type TraverseMethod = (typeof traverseMethod.enumValues)[number];
export type DuctShape = (typeof ductShape.enumValues)[number];
export type AirService = (typeof airService.enumValues)[number];
export type TerminalType = (typeof terminalType.enumValues)[number];
export type TerminalReadingPhase = (typeof terminalReadingPhase.enumValues)[number];
export type TerminalReadingMethod = (typeof terminalReadingMethod.enumValues)[number];
export type TerminalSetpoint = (typeof terminalSetpoint.enumValues)[number];
export type VelocityBasis = (typeof velocityBasis.enumValues)[number];
export type InstrumentKind = (typeof instrumentKind.enumValues)[number];
export type BoxOverride = (typeof boxOverride.enumValues)[number];
export type FilterState = (typeof filterState.enumValues)[number];

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
    // Acceptance bands as % of design, below (minus) and above (plus); contract documents govern.
    // Defaults are common practice: ±10 % for outlets, terminal units and sections, ±5 % for fans, −0/+10 % outside air.
    fanToleranceMinusPct: doublePrecision("fan_tolerance_minus_pct").notNull().default(5),
    fanTolerancePlusPct: doublePrecision("fan_tolerance_plus_pct").notNull().default(5),
    sectionToleranceMinusPct: doublePrecision("section_tolerance_minus_pct").notNull().default(10),
    sectionTolerancePlusPct: doublePrecision("section_tolerance_plus_pct").notNull().default(10),
    outletToleranceMinusPct: doublePrecision("outlet_tolerance_minus_pct").notNull().default(10),
    outletTolerancePlusPct: doublePrecision("outlet_tolerance_plus_pct").notNull().default(10),
    terminalUnitToleranceMinusPct: doublePrecision("terminal_unit_tolerance_minus_pct").notNull().default(10),
    terminalUnitTolerancePlusPct: doublePrecision("terminal_unit_tolerance_plus_pct").notNull().default(10),
    outsideAirToleranceMinusPct: doublePrecision("outside_air_tolerance_minus_pct").notNull().default(0),
    outsideAirTolerancePlusPct: doublePrecision("outside_air_tolerance_plus_pct").notNull().default(10),
    continuityTolerancePct: doublePrecision("continuity_tolerance_pct").notNull().default(10),
    /**
     * Verification sample: the share of a submitted system's outlets, terminal units and sections the
     * commissioning agent re-reads (10 %, common practice), never fewer than `sampleMinCount`; a reading
     * agrees when within ±`sampleTolerancePct` of the technician's (±10 %, common practice); more than
     * `sampleAllowedFailures` disagreements recommend returning the whole system.
     */
    samplePct: doublePrecision("sample_pct").notNull().default(10),
    sampleMinCount: integer("sample_min_count").notNull().default(3),
    sampleTolerancePct: doublePrecision("sample_tolerance_pct").notNull().default(10),
    sampleAllowedFailures: integer("sample_allowed_failures").notNull().default(0),
    createdAt: createdAt(),
  },
  (t) => [
    check("projects_density_range", sql`${t.standardDensityKgM3} between 0.5 and 2`),
    check("projects_altitude_range", sql`${t.altitudeM} between -500 and 5000`),
    check(
      "projects_sample_range",
      sql`${t.samplePct} > 0 and ${t.samplePct} <= 100 and ${t.sampleMinCount} between 1 and 500 and ${t.sampleTolerancePct} > 0 and ${t.sampleTolerancePct} <= 50 and ${t.sampleAllowedFailures} between 0 and 500`,
    ),
    check(
      "projects_tolerance_range",
      sql`least(${t.fanToleranceMinusPct}, ${t.fanTolerancePlusPct}, ${t.sectionToleranceMinusPct}, ${t.sectionTolerancePlusPct}, ${t.outletToleranceMinusPct}, ${t.outletTolerancePlusPct}, ${t.terminalUnitToleranceMinusPct}, ${t.terminalUnitTolerancePlusPct}, ${t.outsideAirToleranceMinusPct}, ${t.outsideAirTolerancePlusPct}, ${t.continuityTolerancePct}) >= 0 and greatest(${t.fanToleranceMinusPct}, ${t.fanTolerancePlusPct}, ${t.sectionToleranceMinusPct}, ${t.sectionTolerancePlusPct}, ${t.outletToleranceMinusPct}, ${t.outletTolerancePlusPct}, ${t.terminalUnitToleranceMinusPct}, ${t.terminalUnitTolerancePlusPct}, ${t.outsideAirToleranceMinusPct}, ${t.outsideAirTolerancePlusPct}, ${t.continuityTolerancePct}) <= 100`,
    ),
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
    /** Minimum outside air the system must bring in (supply systems), at standard air. */
    designOutsideAirM3S: doublePrecision("design_outside_air_m3_s"),
    // Motor nameplate, for the fan-law aids and the report; the drive's limits are a qualified person's call.
    motorPowerKw: doublePrecision("motor_power_kw"),
    motorSpeedRpm: doublePrecision("motor_speed_rpm"),
    motorFullLoadAmps: doublePrecision("motor_full_load_amps"),
    motorVolts: doublePrecision("motor_volts"),
    motorPhases: integer("motor_phases"),
    motorServiceFactor: doublePrecision("motor_service_factor"),
    hasVfd: boolean("has_vfd").notNull().default(false),
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
    device: text("device").notNull().default(""),
    room: text("room").notNull().default(""),
    designFlowM3S: doublePrecision("design_flow_m3_s").notNull(),
    effectiveAreaM2: doublePrecision("effective_area_m2"),
    /** Outlet or inlet (diffuser, grille, register) or terminal unit (VAV or constant-volume box). */
    type: terminalType("type").notNull().default("diffuser"),
    service: airService("service").notNull().default("supply"),
    /** Neck size of an outlet, inlet size of a terminal unit (inside dimensions, mm). */
    sizeShape: ductShape("size_shape"),
    diameterMm: doublePrecision("diameter_mm"),
    widthMm: doublePrecision("width_mm"),
    heightMm: doublePrecision("height_mm"),
    // Terminal units: designFlowM3S is the design maximum; these are the other scheduled setpoints.
    designMinFlowM3S: doublePrecision("design_min_flow_m3_s"),
    designHeatingFlowM3S: doublePrecision("design_heating_flow_m3_s"),
    /** The box controller's flow factor (its velocity-pressure sensor's multiplier), as configured. */
    controllerFlowFactor: doublePrecision("controller_flow_factor"),
    createdAt: createdAt(),
  },
  (t) => [
    index("terminals_section_idx").on(t.sectionId),
    uniqueIndex("terminals_section_tag_idx").on(t.sectionId, t.tag),
  ],
);

/**
 * The organisation's instrument register, shared by every project: what a crew carries, with serial
 * numbers and calibration dates. Ranges and accuracies are in SI for the instrument's kind
 * (Pa for manometers, m/s for anemometers, m³/s for capture hoods, °C / % RH, Pa for barometers).
 */
export const instruments = pgTable(
  "instruments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    kind: instrumentKind("kind").notNull(),
    make: text("make").notNull().default(""),
    model: text("model").notNull().default(""),
    serial: text("serial").notNull(),
    calibratedOn: date("calibrated_on", { mode: "string" }),
    calibrationDueOn: date("calibration_due_on", { mode: "string" }),
    /**
     * The calibration laboratory's certificate number, as printed on the certificate. The certificate
     * file itself (an upload) will live in its own table pointing at this row; nothing stores it yet.
     */
    certificateNumber: text("certificate_number").notNull().default(""),
    rangeMin: doublePrecision("range_min"),
    rangeMax: doublePrecision("range_max"),
    /** Maker's accuracy as ± % of reading plus ± a floor in the kind's unit (a specification limit, not a standard uncertainty). */
    accuracyPct: doublePrecision("accuracy_pct"),
    accuracyFloor: doublePrecision("accuracy_floor"),
    /** Thermo-hygrometers: relative-humidity accuracy, ± % RH (the temperature accuracy is accuracyFloor, °C). */
    humidityAccuracyPct: doublePrecision("humidity_accuracy_pct"),
    /** Pitot tubes: the calibration coefficient (1.0 for a standard pitot-static tube) and the head's outside diameter. */
    probeCoefficient: doublePrecision("probe_coefficient"),
    probeHeadDiameterMm: doublePrecision("probe_head_diameter_mm"),
    /** Capture hoods: the maker's correction factor for the hood top in use, when one applies. */
    hoodCorrectionFactor: doublePrecision("hood_correction_factor"),
    notes: text("notes").notNull().default(""),
    /** An instrument that was used is retired, never deleted, so old readings keep naming it. */
    retiredAt: timestamp("retired_at", { withTimezone: true }),
    createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("instruments_kind_serial_idx").on(t.kind, sql`lower(${t.serial})`),
    check("instruments_range_order", sql`${t.rangeMin} is null or ${t.rangeMax} is null or ${t.rangeMin} < ${t.rangeMax}`),
    check("instruments_due_after_calibration", sql`${t.calibratedOn} is null or ${t.calibrationDueOn} is null or ${t.calibrationDueOn} > ${t.calibratedOn}`),
  ],
);

/**
 * The conditions a system was running under while a set of readings was taken. Readings taken under
 * different recorded conditions are not compared or summed without a warning.
 */
export const operatingConditions = pgTable(
  "operating_conditions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    systemId: uuid("system_id")
      .notNull()
      .references(() => airSystems.id, { onDelete: "cascade" }),
    fanSpeedRpm: doublePrecision("fan_speed_rpm"),
    vfdHz: doublePrecision("vfd_hz"),
    boxes: boxOverride("boxes").notNull().default("none"),
    /** Outside-air damper (economizer) position, % open; null when the system has none or it was not seen. */
    outsideAirDamperPct: doublePrecision("outside_air_damper_pct"),
    ductStaticSetpointPa: doublePrecision("duct_static_setpoint_pa"),
    filterState: filterState("filter_state").notNull().default("unknown"),
    notes: text("notes").notNull().default(""),
    recordedBy: uuid("recorded_by").references(() => users.id, { onDelete: "set null" }),
    recordedAt: timestamp("recorded_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("operating_conditions_system_idx").on(t.systemId, t.recordedAt)],
);

/** A system's terminal readings, submitted and reviewed together like a traverse. */
export const terminalSets = pgTable(
  "terminal_sets",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    systemId: uuid("system_id")
      .notNull()
      .references(() => airSystems.id, { onDelete: "cascade" }),
    status: traverseStatus("status").notNull().default("draft"),
    version: integer("version").notNull().default(1),
    revision: integer("revision").notNull().default(1),
    notes: text("notes").notNull().default(""),
    submittedBy: uuid("submitted_by").references(() => users.id, { onDelete: "set null" }),
    submittedAt: timestamp("submitted_at", { withTimezone: true }),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("terminal_sets_system_idx").on(t.systemId),
    // A system's readings go into its one open set (draft, or returned for rework); a submitted or approved set is closed.
    uniqueIndex("terminal_sets_one_open_idx").on(t.systemId).where(sql`${t.status} in ('draft', 'returned')`),
  ],
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
    /** Outside diameter of the probe head, mm (from the pitot tube in the register): judges which wall points it can reach. Null: the engine's 8 mm. */
    probeHeadDiameterMm: doublePrecision("probe_head_diameter_mm"),
    /**
     * The maker's accuracies of the instruments used, as the engine's uncertainty inputs (engineAccuracy of
     * lib/instruments/accuracy.ts), copied from the register when the instruments are chosen, so a later
     * change of the register does not change this traverse's result.
     */
    instrumentAccuracy: jsonb("instrument_accuracy").$type<Partial<InstrumentAccuracy>>().notNull().default({}),
    /** Anemometer traverses read as standard velocity: the density the anemometer refers to (its manual), kg/m³. Null: the project's standard density. */
    instrumentStandardDensityKgM3: doublePrecision("instrument_standard_density_kg_m3"),
    dryBulbC: doublePrecision("dry_bulb_c"),
    wetBulbC: doublePrecision("wet_bulb_c"),
    relativeHumidityPct: doublePrecision("relative_humidity_pct"),
    barometricPa: doublePrecision("barometric_pa"),
    staticPa: doublePrecision("static_pa"),
    portOffsetMm: doublePrecision("port_offset_mm").notNull().default(0),
    /** The manometer or anemometer the points were read with, the pitot tube, and the air instrument. */
    instrumentId: uuid("instrument_id").references(() => instruments.id, { onDelete: "set null" }),
    probeInstrumentId: uuid("probe_instrument_id").references(() => instruments.id, { onDelete: "set null" }),
    airInstrumentId: uuid("air_instrument_id").references(() => instruments.id, { onDelete: "set null" }),
    barometerInstrumentId: uuid("barometer_instrument_id").references(() => instruments.id, { onDelete: "set null" }),
    /** Why an instrument past its calibration due date was used; required before submission. */
    overdueReason: text("overdue_reason").notNull().default(""),
    conditionsId: uuid("conditions_id").references(() => operatingConditions.id, { onDelete: "set null" }),
    /** 1 for a section's first traverse; a re-traverse of the same section takes the next number. */
    revision: integer("revision").notNull().default(1),
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
    // A re-traverse takes the next revision of its section: two at once cannot both take the same one.
    uniqueIndex("traverses_section_revision_idx").on(t.sectionId, t.revision),
    check("traverses_counts", sql`${t.lines} >= 1 and ${t.pointsPerLine} >= 2`),
    check("traverses_version_positive", sql`${t.version} >= 1`),
  ],
);

/**
 * One point of a traverse (line and point 1-based): velocity pressure (Pa) or velocity (m/s), per the
 * traverse's readingsKind; or a point the probe could not reach for an obstruction (`unreadable`, no
 * value). A point not read yet has no row.
 */
export const readings = pgTable(
  "readings",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    traverseId: uuid("traverse_id")
      .notNull()
      .references(() => traverses.id, { onDelete: "cascade" }),
    line: integer("line").notNull(),
    point: integer("point").notNull(),
    value: doublePrecision("value"),
    unreadable: boolean("unreadable").notNull().default(false),
    recordedAt: timestamp("recorded_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("readings_position_idx").on(t.traverseId, t.line, t.point),
    check("readings_value_or_unreadable", sql`(${t.unreadable} and ${t.value} is null) or (not ${t.unreadable} and ${t.value} is not null)`),
  ],
);

/**
 * One reading of an outlet, inlet or terminal unit: by capture hood, by velocity × effective area, or
 * from a traverse of its duct. Re-readings after an adjustment are new rows; nothing is overwritten.
 * Flows are m³/s: `flowM3S` at the air's actual density, `standardFlowM3S` referred to the project's
 * standard density, which is what design airflows are scheduled at.
 */
export const terminalReadings = pgTable(
  "terminal_readings",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    terminalId: uuid("terminal_id")
      .notNull()
      .references(() => terminals.id, { onDelete: "cascade" }),
    setId: uuid("set_id")
      .notNull()
      .references(() => terminalSets.id, { onDelete: "cascade" }),
    phase: terminalReadingPhase("phase").notNull(),
    method: terminalReadingMethod("method").notNull(),
    setpoint: terminalSetpoint("setpoint").notNull().default("design"),
    /** Capture hood: the flow shown, the correction factor applied, and what the hood already corrected for. */
    hoodFlowM3S: doublePrecision("hood_flow_m3_s"),
    hoodCorrectionFactor: doublePrecision("hood_correction_factor"),
    hoodDensityCorrected: boolean("hood_density_corrected"),
    hoodBackPressureCompensated: boolean("hood_back_pressure_compensated"),
    /** Velocity × effective area: the point velocities (m/s), whether they are actual or standard, and the effective area used (m²). */
    velocitiesMS: jsonb("velocities_m_s").$type<number[]>(),
    velocityBasis: velocityBasis("velocity_basis"),
    effectiveAreaM2: doublePrecision("effective_area_m2"),
    /** A traverse of the terminal's own duct, and the traverse's version whose airflow was taken. */
    traverseId: uuid("traverse_id").references(() => traverses.id, { onDelete: "set null" }),
    traverseVersion: integer("traverse_version"),
    /** Air at the terminal, for the density correction: dry-bulb, RH when measured, a barometer's reading when one was read. */
    dryBulbC: doublePrecision("dry_bulb_c"),
    relativeHumidityPct: doublePrecision("relative_humidity_pct"),
    barometricPa: doublePrecision("barometric_pa"),
    /** The air density at the terminal the reading was referred with (kg/m³), kept so the record explains itself. */
    densityKgM3: doublePrecision("density_kg_m3"),
    flowM3S: doublePrecision("flow_m3_s").notNull(),
    standardFlowM3S: doublePrecision("standard_flow_m3_s").notNull(),
    /** Terminal units: the airflow the box controller displayed at the same moment. */
    controllerFlowM3S: doublePrecision("controller_flow_m3_s"),
    /** Terminal units: the controller's flow factor as found at the reading (the design's when not stated). */
    controllerFlowFactor: doublePrecision("controller_flow_factor"),
    damperMarked: boolean("damper_marked").notNull().default(false),
    conditionsId: uuid("conditions_id").references(() => operatingConditions.id, { onDelete: "set null" }),
    instrumentId: uuid("instrument_id").references(() => instruments.id, { onDelete: "set null" }),
    /** The thermometer or thermo-hygrometer that read the air at the terminal, when one was named. */
    airInstrumentId: uuid("air_instrument_id").references(() => instruments.id, { onDelete: "set null" }),
    overdueReason: text("overdue_reason").notNull().default(""),
    notes: text("notes").notNull().default(""),
    takenBy: uuid("taken_by").references(() => users.id, { onDelete: "set null" }),
    takenAt: timestamp("taken_at", { withTimezone: true }).notNull().defaultNow(),
    createdAt: createdAt(),
  },
  (t) => [index("terminal_readings_terminal_idx").on(t.terminalId, t.takenAt), index("terminal_readings_set_idx").on(t.setId)],
);

/**
 * A commissioning agent's decision on one version of a traverse or of a system's terminal set: exactly
 * one of the two is named, with the version the decision applies to. `systemWide` marks a decision
 * taken for a whole system at once (every submitted item of it, in one transaction).
 */
export const reviews = pgTable(
  "reviews",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    traverseId: uuid("traverse_id").references(() => traverses.id, { onDelete: "cascade" }),
    terminalSetId: uuid("terminal_set_id").references(() => terminalSets.id, { onDelete: "cascade" }),
    reviewerId: uuid("reviewer_id")
      .notNull()
      .references(() => users.id),
    decision: reviewDecision("decision").notNull(),
    reason: text("reason").notNull().default(""),
    witnessed: boolean("witnessed").notNull().default(false),
    /** The version of the traverse (or, for a terminal set, of the set) the decision applies to. */
    traverseVersion: integer("traverse_version").notNull(),
    systemWide: boolean("system_wide").notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [
    index("reviews_traverse_idx").on(t.traverseId),
    index("reviews_terminal_set_idx").on(t.terminalSetId),
    check("reviews_one_item", sql`(${t.traverseId} is null) <> (${t.terminalSetId} is null)`),
  ],
);

export const sampleItemKind = pgEnum("sample_item_kind", ["outlet", "terminal_unit", "section"]);
export type SampleItemKind = (typeof sampleItemKind.enumValues)[number];
export const sampleStatus = pgEnum("sample_status", ["open", "closed"]);

/**
 * A verification sample of one submitted system, drawn by a commissioning agent: the seed and the rule
 * it was drawn with are kept, so the same draw can be shown again; the outcome is kept up to date as
 * the agent's readings come in.
 */
export const verificationSamples = pgTable(
  "verification_samples",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    systemId: uuid("system_id")
      .notNull()
      .references(() => airSystems.id, { onDelete: "cascade" }),
    /** 32-bit unsigned seed of the xoroshiro128+ generator (pure-rand) the draw used. */
    seed: bigint("seed", { mode: "number" }).notNull(),
    samplePct: doublePrecision("sample_pct").notNull(),
    minCount: integer("min_count").notNull(),
    tolerancePct: doublePrecision("tolerance_pct").notNull(),
    allowedFailures: integer("allowed_failures").notNull(),
    /** How many candidates there were, and the ids in the order they were considered (the population). */
    population: jsonb("population").$type<{ kind: SampleItemKind; id: string; tag: string }[]>().notNull(),
    status: sampleStatus("status").notNull().default("open"),
    agreedCount: integer("agreed_count").notNull().default(0),
    disagreedCount: integer("disagreed_count").notNull().default(0),
    /** True once more items disagree than the project allows: the app recommends returning the system. */
    recommendReturn: boolean("recommend_return").notNull().default(false),
    drawnBy: uuid("drawn_by").references(() => users.id, { onDelete: "set null" }),
    drawnAt: timestamp("drawn_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("verification_samples_system_idx").on(t.systemId, t.drawnAt)],
);

/**
 * One sampled outlet, terminal unit or section, with the technician's airflow it is compared with (the
 * latest reading or traverse at the draw) and the agent's own reading once entered.
 */
export const verificationSampleItems = pgTable(
  "verification_sample_items",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    sampleId: uuid("sample_id")
      .notNull()
      .references(() => verificationSamples.id, { onDelete: "cascade" }),
    position: integer("position").notNull(),
    kind: sampleItemKind("kind").notNull(),
    terminalId: uuid("terminal_id").references(() => terminals.id, { onDelete: "cascade" }),
    sectionId: uuid("section_id").references(() => ductSections.id, { onDelete: "cascade" }),
    tag: text("tag").notNull(),
    /** The technician's reading compared with: a terminal reading or a traverse, its standard airflow and conditions. */
    technicianReadingId: uuid("technician_reading_id").references(() => terminalReadings.id, { onDelete: "set null" }),
    technicianTraverseId: uuid("technician_traverse_id").references(() => traverses.id, { onDelete: "set null" }),
    technicianFlowM3S: doublePrecision("technician_flow_m3_s"),
    technicianConditionsId: uuid("technician_conditions_id").references(() => operatingConditions.id, { onDelete: "set null" }),
    /** The agent's reading: how, the inputs, the standard airflow it gives, the conditions it was read under. */
    agentMethod: text("agent_method"),
    agentDetail: jsonb("agent_detail").$type<Record<string, unknown>>(),
    agentFlowM3S: doublePrecision("agent_flow_m3_s"),
    agentConditionsId: uuid("agent_conditions_id").references(() => operatingConditions.id, { onDelete: "set null" }),
    conditionsDiffer: jsonb("conditions_differ").$type<string[]>(),
    differencePct: doublePrecision("difference_pct"),
    agrees: boolean("agrees"),
    witnessed: boolean("witnessed").notNull().default(false),
    readBy: uuid("read_by").references(() => users.id, { onDelete: "set null" }),
    readAt: timestamp("read_at", { withTimezone: true }),
  },
  (t) => [
    uniqueIndex("verification_sample_items_position_idx").on(t.sampleId, t.position),
    check("verification_sample_items_one_item", sql`(${t.terminalId} is null) <> (${t.sectionId} is null)`),
  ],
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
export type Instrument = typeof instruments.$inferSelect;
export type OperatingConditions = typeof operatingConditions.$inferSelect;
export type TerminalSet = typeof terminalSets.$inferSelect;
export type TerminalReading = typeof terminalReadings.$inferSelect;
export type VerificationSample = typeof verificationSamples.$inferSelect;
export type VerificationSampleItem = typeof verificationSampleItems.$inferSelect;

// ── E-mail, notifications, invitations, the TAB supervisor, uploads and issued reports ──────────────

/** What a notification or e-mail is about; the review workflow, report issue and invitations. */
export const notificationKind = pgEnum("notification_kind", [
  "traverse.submitted",
  "traverse.returned",
  "traverse.approved",
  "terminal_set.submitted",
  "terminal_set.returned",
  "terminal_set.approved",
  "report.issued",
  "invitation",
  "member.added",
]);
/**
 * An e-mail's way out: "outbox" is kept here only (no SMTP_URL: the local fake); "queued" waits for the
 * delivery worker, "sending" is claimed by one, "sent" went to the SMTP server, "failed" gave up.
 */
export const mailStatus = pgEnum("mail_status", ["outbox", "queued", "sending", "sent", "failed"]);
export const reportStatus = pgEnum("report_status", ["issued"]);

export type NotificationKind = (typeof notificationKind.enumValues)[number];
export type MailStatus = (typeof mailStatus.enumValues)[number];

/** Every e-mail the app sends, kept whether or not an SMTP server delivers it (the outbox). */
export const mailMessages = pgTable(
  "mail_messages",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id").references(() => projects.id, { onDelete: "set null" }),
    kind: notificationKind("kind").notNull(),
    toAddress: text("to_address").notNull(),
    toName: text("to_name").notNull().default(""),
    subject: text("subject").notNull(),
    text: text("text").notNull(),
    html: text("html").notNull(),
    status: mailStatus("status").notNull(),
    attempts: integer("attempts").notNull().default(0),
    nextAttemptAt: timestamp("next_attempt_at", { withTimezone: true }).notNull().defaultNow(),
    lastError: text("last_error").notNull().default(""),
    messageId: text("message_id"),
    createdAt: createdAt(),
    sentAt: timestamp("sent_at", { withTimezone: true }),
  },
  (t) => [index("mail_messages_status_idx").on(t.status, t.nextAttemptAt), index("mail_messages_created_idx").on(t.createdAt)],
);

/** In-app notices, one per recipient: what happened, where to look, and whether they have read it. */
export const notifications = pgTable(
  "notifications",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    userId: uuid("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    projectId: uuid("project_id").references(() => projects.id, { onDelete: "cascade" }),
    kind: notificationKind("kind").notNull(),
    message: text("message").notNull(),
    link: text("link").notNull().default(""),
    readAt: timestamp("read_at", { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [index("notifications_user_idx").on(t.userId, t.createdAt)],
);

/**
 * An invitation to join a project with a role. The link carries `<id>.<secret>`; only the SHA-256 of
 * the secret is stored. Single use, and it expires.
 */
export const invitations = pgTable(
  "invitations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    role: memberRole("role").notNull(),
    tokenHash: text("token_hash").notNull(),
    invitedBy: uuid("invited_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    acceptedAt: timestamp("accepted_at", { withTimezone: true }),
    acceptedBy: uuid("accepted_by").references(() => users.id, { onDelete: "set null" }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (t) => [
    index("invitations_project_idx").on(t.projectId),
    // One open invitation per address and project; inviting again replaces it.
    uniqueIndex("invitations_open_idx")
      .on(t.projectId, sql`lower(${t.email})`)
      .where(sql`${t.acceptedAt} is null and ${t.revokedAt} is null`),
  ],
);

/** The project's certified TAB supervisor: a technician member, with the body that certified them. */
export const projectSupervisors = pgTable("project_supervisors", {
  projectId: uuid("project_id")
    .primaryKey()
    .references(() => projects.id, { onDelete: "cascade" }),
  userId: uuid("user_id")
    .notNull()
    .references(() => users.id, { onDelete: "cascade" }),
  certifyingBody: text("certifying_body").notNull(),
  certificateNumber: text("certificate_number").notNull(),
  designatedBy: uuid("designated_by").references(() => users.id, { onDelete: "set null" }),
  designatedAt: timestamp("designated_at", { withTimezone: true }).notNull().defaultNow(),
});

/**
 * The supervisor's signed certification statement, as signed: name, certification and the exact
 * words, kept even if the designation changes later. A person's statement, separate from the
 * server's signature on the report file.
 */
export const supervisorSignatures = pgTable(
  "supervisor_signatures",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    userId: uuid("user_id").references(() => users.id, { onDelete: "set null" }),
    name: text("name").notNull(),
    certifyingBody: text("certifying_body").notNull(),
    certificateNumber: text("certificate_number").notNull(),
    statement: text("statement").notNull(),
    signedAt: timestamp("signed_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("supervisor_signatures_project_idx").on(t.projectId, t.signedAt)],
);

/** A photo of a traverse location (a duct section), optionally of one traverse; the bytes live in object storage. */
export const photos = pgTable(
  "photos",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    sectionId: uuid("section_id")
      .notNull()
      .references(() => ductSections.id, { onDelete: "cascade" }),
    traverseId: uuid("traverse_id").references(() => traverses.id, { onDelete: "set null" }),
    objectKey: text("object_key").notNull().unique(),
    thumbKey: text("thumb_key"),
    contentType: text("content_type").notNull(),
    bytes: integer("bytes").notNull(),
    width: integer("width"),
    height: integer("height"),
    fileName: text("file_name").notNull().default(""),
    caption: text("caption").notNull().default(""),
    takenBy: uuid("taken_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("photos_section_idx").on(t.sectionId, t.createdAt)],
);

/** An instrument's calibration certificate (PDF or image); the newest one is current, older ones stay. */
export const instrumentCertificates = pgTable(
  "instrument_certificates",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    instrumentId: uuid("instrument_id")
      .notNull()
      .references(() => instruments.id, { onDelete: "cascade" }),
    objectKey: text("object_key").notNull().unique(),
    thumbKey: text("thumb_key"),
    contentType: text("content_type").notNull(),
    bytes: integer("bytes").notNull(),
    fileName: text("file_name").notNull().default(""),
    uploadedBy: uuid("uploaded_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("instrument_certificates_instrument_idx").on(t.instrumentId, t.createdAt)],
);

export interface ReportSigner {
  userId?: string | null;
  name: string;
  /** What they approved as, in words (e.g. "Commissioning agent", "Engineer of record", "TAB supervisor"). */
  role: string;
  /** ISO 8601 time of their approval or signature in the app. */
  at: string;
}

/**
 * An issued closeout report: the SHA-256 of its exact bytes, the deployment's Ed25519 signature over
 * them, the public key that checks it, and where the PDF lives. Never changed after issue (a trigger
 * allows only marking it superseded, once); a new revision supersedes it.
 */
export const reports = pgTable(
  "reports",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "restrict" }),
    revision: integer("revision").notNull(),
    status: reportStatus("status").notNull().default("issued"),
    code: text("code").notNull().unique(),
    sha256: text("sha256").notNull(),
    signature: text("signature").notNull(),
    publicKeyPem: text("public_key_pem").notNull(),
    keyId: text("key_id").notNull(),
    objectKey: text("object_key").notNull().unique(),
    bytes: integer("bytes").notNull(),
    fileName: text("file_name").notNull(),
    issuedAt: timestamp("issued_at", { withTimezone: true }).notNull().defaultNow(),
    issuedBy: uuid("issued_by").references(() => users.id, { onDelete: "set null" }),
    issuedByName: text("issued_by_name").notNull(),
    signers: jsonb("signers").$type<ReportSigner[]>().notNull(),
    reason: text("reason").notNull().default(""),
    supersededBy: uuid("superseded_by").references((): AnyPgColumn => reports.id),
    supersededAt: timestamp("superseded_at", { withTimezone: true }),
  },
  (t) => [uniqueIndex("reports_project_revision_idx").on(t.projectId, t.revision), index("reports_sha256_idx").on(t.sha256)],
);

export type MailMessage = typeof mailMessages.$inferSelect;
export type Notification = typeof notifications.$inferSelect;
export type Invitation = typeof invitations.$inferSelect;
export type ProjectSupervisor = typeof projectSupervisors.$inferSelect;
export type SupervisorSignature = typeof supervisorSignatures.$inferSelect;
export type Photo = typeof photos.$inferSelect;
export type InstrumentCertificate = typeof instrumentCertificates.$inferSelect;
export type Report = typeof reports.$inferSelect;

/**
 * A report-level approval: the commissioning agent or the engineer of record approving the closeout
 * report's content as it stood, for the revision it would become. The fingerprint is the SHA-256 of
 * that content (lib/server/report-approvals.ts): any later change of the data makes it differ, and
 * the approval no longer counts. Rows are kept, never changed, as the record of who approved what.
 */
export const reportApprovals = pgTable(
  "report_approvals",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    userId: uuid("user_id").references(() => users.id, { onDelete: "set null" }),
    name: text("name").notNull(),
    role: memberRole("role").notNull(),
    forRevision: integer("for_revision").notNull(),
    fingerprint: text("fingerprint").notNull(),
    comment: text("comment").notNull().default(""),
    approvedAt: timestamp("approved_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("report_approvals_project_idx").on(t.projectId, t.approvedAt),
    check("report_approvals_role", sql`${t.role} in ('commissioning_agent', 'engineer')`),
  ],
);
export type ReportApprovalRow = typeof reportApprovals.$inferSelect;

/** What an accepted deviation is about: a duct section, an outlet or terminal unit, a junction's continuity, or a system-level result. */
export const deviationSubject = pgEnum("deviation_subject", ["section", "terminal", "junction", "system"]);
export type DeviationSubject = (typeof deviationSubject.enumValues)[number];

/**
 * The engineer of record's acceptance of a result outside its tolerance, with the reason and the value
 * it was accepted at. `entityId` is the section, terminal, junction's parent section or system (no
 * foreign key: the acceptance is history and outlives a design change); `measure` says which result of
 * it (a terminal's setpoint, "design" for a section's % of design, "continuity", or a system's "fan",
 * "unaccounted" or "outside_air"). Withdrawing keeps the row and records who, when and why; at most one
 * acceptance of the same result stands at a time.
 */
export const acceptedDeviations = pgTable(
  "accepted_deviations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    subject: deviationSubject("subject").notNull(),
    entityId: uuid("entity_id").notNull(),
    measure: text("measure").notNull(),
    /** The item's tag and what was judged, as they read when accepted ("S1.2 · % of design"). */
    label: text("label").notNull(),
    /** The result when accepted, in `valueUnit` (e.g. 86.4 and "% of design"), and the band it was outside. */
    acceptedValue: doublePrecision("accepted_value").notNull(),
    valueUnit: text("value_unit").notNull(),
    tolerance: text("tolerance").notNull(),
    reason: text("reason").notNull(),
    acceptedBy: uuid("accepted_by").references(() => users.id, { onDelete: "set null" }),
    acceptedByName: text("accepted_by_name").notNull(),
    acceptedAt: timestamp("accepted_at", { withTimezone: true }).notNull().defaultNow(),
    withdrawnBy: uuid("withdrawn_by").references(() => users.id, { onDelete: "set null" }),
    withdrawnByName: text("withdrawn_by_name"),
    withdrawnAt: timestamp("withdrawn_at", { withTimezone: true }),
    withdrawReason: text("withdraw_reason"),
  },
  (t) => [
    index("accepted_deviations_project_idx").on(t.projectId, t.acceptedAt),
    uniqueIndex("accepted_deviations_one_standing_idx").on(t.projectId, t.subject, t.entityId, t.measure).where(sql`${t.withdrawnAt} is null`),
    check("accepted_deviations_reason", sql`length(${t.reason}) between 1 and 2000`),
    check(
      "accepted_deviations_withdrawal",
      sql`(${t.withdrawnAt} is null and ${t.withdrawReason} is null) or (${t.withdrawnAt} is not null and length(coalesce(${t.withdrawReason}, '')) between 1 and 2000)`,
    ),
  ],
);

export type AcceptedDeviation = typeof acceptedDeviations.$inferSelect;
