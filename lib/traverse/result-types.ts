/**
 * The calc `traverse` output in camelCase (lib/airflow/commands.ts runTraverse, through camelKeys): the
 * parts the screens read. The API's `traverse.result` adds pctOfDesign, counts and complete.
 */
export interface TraversePointJson {
  line: number;
  point: number;
  xMm: number;
  yMm: number;
  depthMm: number;
  positionMm: number;
  readPositionMm: number;
  beyondProbeReach?: boolean;
  reading: number | null;
  velocityPressurePa: number | null;
  velocityMS: number | null;
  filledFrom?: "mirror" | "along-line" | "across-lines" | "same-radius";
  filledVelocityMS?: number;
}

export interface FlowUncertaintyJson {
  expandedPct: number | null;
  combinedStandardPct: number | null;
}

export interface TraverseResultJson {
  method: string;
  rule: string;
  readingsKind: string;
  integrationRule: "equal-weight" | "tributary-area";
  filledPoints: number;
  densityKgM3: number;
  standardDensityKgM3: number;
  meanVelocityMS: number;
  areaM2: number;
  flowM3S: number;
  standardFlowM3S: number;
  massFlowKgS: number;
  reynolds: number;
  air: { dryBulbC: number; barometricPa: number; barometricSource: string; staticPa: number; staticAssumed: boolean; absolutePressurePa: number; relativeHumidityPct: number };
  points: TraversePointJson[];
  quality: { verdict: "good" | "marginal" | "poor"; reasons: string[]; shareAboveTenthOfMax: number; maxOverMean: number | null; cv: number | null };
  uncertainty: {
    expandedPct: number | null;
    coverageFactor: number;
    shown: string;
    actual: FlowUncertaintyJson;
    standard: FlowUncertaintyJson;
    mass: FlowUncertaintyJson;
  };
  warnings: string[];
  pctOfDesign?: number;
  counts?: { points: number; read: number; unreadable: number; notRead: number };
  complete?: boolean;
}

/** The calc `layout` output in camelCase. */
export interface LayoutJson {
  method: string;
  rule: string;
  lineCount: number;
  pointsPerLine: number;
  recommended: { lines: number; pointsPerLine: number };
  wallMinimumMm: number;
  probeHeadDiameterMm: number;
  probeReachMm: number;
  beyondProbeReachCount: number;
  reachableCounts: { lines: number; pointsPerLine: number } | null;
  lines: { angleDeg?: number; xMm?: number; points: { xMm: number; yMm: number; depthMm: number; positionMm: number; readPositionMm: number; movedFromWall?: boolean; beyondProbeReach?: boolean }[] }[];
  reason: string;
  warnings: string[];
}
