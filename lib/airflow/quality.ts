/**
 * Plane quality: is the velocity profile at this plane even enough to trust a traverse?
 *
 * Criteria and bands (all "common practice" unless noted; none is a hard gate — a poor plane still
 * gives a number, with the reasons to distrust it):
 * - share of points whose velocity pressure exceeds a tenth of the largest: > 75 % satisfactory
 *   (fan field-testing practice, from memory); 50–75 % marginal; under 50 % poor;
 * - max/mean velocity: ≤ 1.5 good, ≤ 2.0 marginal, above poor;
 * - coefficient of variation of point velocities: ≤ 0.25 good, ≤ 0.40 marginal, above poor;
 * - zero or negative readings (no forward flow at the point): any is marginal, over 10 % poor;
 * - velocity pressures under 5 Pa (a ±1 Pa gauge is then ±9 % on velocity at 3 m/s): over half of
 *   the points marginal (a precision problem, not a profile one). Only for readings taken as pressures:
 *   an anemometer's error does not depend on the velocity pressure its reading corresponds to.
 */

export type Verdict = "good" | "marginal" | "poor";

export interface PlaneQuality {
  /** Fraction 0…1 of points whose Pv exceeds 0.1 × the largest Pv. */
  shareAboveTenthOfMax: number;
  /** Largest point velocity / mean point velocity. */
  maxOverMean: number;
  /** Sample standard deviation / mean of point velocities. */
  cv: number;
  zeroOrNegativeCount: number;
  /** Points read as pressures with 0 < Pv < 5 Pa (always 0 for anemometer readings). */
  lowPressureCount: number;
  count: number;
  verdict: Verdict;
  reasons: string[];
}

/** Satisfactory share of points above a tenth of the largest Pv (fan field-testing practice, from memory). */
export const SHARE_ABOVE_TENTH_GOOD = 0.75;
const SHARE_ABOVE_TENTH_MARGINAL = 0.5;
const MAX_OVER_MEAN_GOOD = 1.5;
const MAX_OVER_MEAN_MARGINAL = 2.0;
const CV_GOOD = 0.25;
const CV_MARGINAL = 0.4;
const ZERO_SHARE_POOR = 0.1;
/** Below this velocity pressure a typical ±1 Pa gauge dominates the error (common practice, ≈ 0.02 in. w.c.). */
export const LOW_VELOCITY_PRESSURE_PA = 5;
const LOW_SHARE_MARGINAL = 0.5;

const RANK: Record<Verdict, number> = { good: 0, marginal: 1, poor: 2 };

/** Adds a criterion's reason; the verdict becomes the worse of the two. */
function grade(verdict: Verdict, v: Verdict, reasons: string[], reason: string): Verdict {
  reasons.push(reason);
  return RANK[v] > RANK[verdict] ? v : verdict;
}

function pct(x: number): string {
  return `${Math.round(x * 100)} %`;
}

/**
 * The sums the plane checks need from the points read, so that a caller that already walks the points
 * (reduceTraverse) gathers them on the way instead of walking them again. Two passes: the first gives the
 * largest Pv and velocity, the sum of velocities and the counts; the second, once the largest Pv and the
 * mean (sumV / count) are known, the points above a tenth of that Pv and the squared deviations.
 */
export interface PlaneSums {
  count: number;
  maxPv: number;
  maxV: number;
  sumV: number;
  zeroOrNegativeCount: number;
  /** Points with 0 < Pv < LOW_VELOCITY_PRESSURE_PA (whatever the kind of reading; assessPlaneFromSums decides). */
  lowPressureCount: number;
  /** Points with Pv > 0.1 × maxPv. */
  aboveTenthCount: number;
  /** Σ (v − sumV/count)². */
  squares: number;
}

/**
 * Judges a traverse plane from its point readings (the points actually read).
 * `velocityPressuresPa[i]` and `velocitiesMS[i]` belong to the same point; velocities of zero or
 * negative readings are 0. With `readAsPressures: false` (anemometer readings, whose Pv is only the
 * equivalent of the velocity) the low-pressure criterion is skipped. Throws RangeError for empty or
 * mismatched inputs.
 */
export function assessPlane(velocityPressuresPa: ArrayLike<number>, velocitiesMS: ArrayLike<number>, options: { readAsPressures?: boolean } = {}): PlaneQuality {
  const count = velocitiesMS.length;
  if (count === 0 || velocityPressuresPa.length !== count) throw new RangeError("assessPlane needs equal, non-empty lists of pressures and velocities");
  const sums: PlaneSums = { count, maxPv: -Infinity, maxV: -Infinity, sumV: 0, zeroOrNegativeCount: 0, lowPressureCount: 0, aboveTenthCount: 0, squares: 0 };
  for (let i = 0; i < count; i++) {
    const pv = velocityPressuresPa[i]!;
    const v = velocitiesMS[i]!;
    if (pv > sums.maxPv) sums.maxPv = pv;
    if (v > sums.maxV) sums.maxV = v;
    sums.sumV += v;
    if (pv <= 0) sums.zeroOrNegativeCount++;
    else if (pv < LOW_VELOCITY_PRESSURE_PA) sums.lowPressureCount++;
  }
  const mean = sums.sumV / count;
  const tenthOfMax = 0.1 * sums.maxPv;
  for (let i = 0; i < count; i++) {
    if (velocityPressuresPa[i]! > tenthOfMax) sums.aboveTenthCount++;
    const d = velocitiesMS[i]! - mean;
    sums.squares += d * d;
  }
  return assessPlaneFromSums(sums, options.readAsPressures !== false);
}

/** assessPlane from the sums of the same points (see PlaneSums). */
export function assessPlaneFromSums(sums: PlaneSums, readAsPressures: boolean): PlaneQuality {
  const { count, maxPv, maxV, sumV, zeroOrNegativeCount, squares } = sums;
  if (!(count > 0)) throw new RangeError("assessPlane needs equal, non-empty lists of pressures and velocities");
  const lowPressureCount = readAsPressures ? sums.lowPressureCount : 0;
  const mean = sumV / count;
  const shareAboveTenthOfMax = maxPv > 0 ? sums.aboveTenthCount / count : 0;
  const variance = count > 1 ? squares / (count - 1) : 0;
  const maxOverMean = mean > 0 ? maxV / mean : Number.POSITIVE_INFINITY;
  const cv = mean > 0 ? Math.sqrt(variance) / mean : Number.POSITIVE_INFINITY;

  // Each criterion adds its reason and may worsen the verdict (module-level helpers: no closure per call).
  const reasons: string[] = [];
  if (mean <= 0) {
    reasons.push("No point shows forward flow: there is nothing to integrate.");
    return { shareAboveTenthOfMax, maxOverMean, cv, zeroOrNegativeCount, lowPressureCount, count, verdict: "poor", reasons };
  }
  let verdict: Verdict = "good";
  if (shareAboveTenthOfMax < SHARE_ABOVE_TENTH_MARGINAL)
    verdict = grade(verdict, "poor", reasons, `Only ${pct(shareAboveTenthOfMax)} of points read more than a tenth of the largest velocity pressure (over 75 % wanted): the flow is concentrated in part of the duct.`);
  else if (shareAboveTenthOfMax <= SHARE_ABOVE_TENTH_GOOD)
    verdict = grade(verdict, "marginal", reasons, `${pct(shareAboveTenthOfMax)} of points read more than a tenth of the largest velocity pressure (over 75 % wanted).`);

  if (maxOverMean > MAX_OVER_MEAN_MARGINAL)
    verdict = grade(verdict, "poor", reasons, `The fastest point is ${maxOverMean.toFixed(2)} × the mean velocity (up to ${MAX_OVER_MEAN_GOOD} expected on a good plane).`);
  else if (maxOverMean > MAX_OVER_MEAN_GOOD)
    verdict = grade(verdict, "marginal", reasons, `The fastest point is ${maxOverMean.toFixed(2)} × the mean velocity (up to ${MAX_OVER_MEAN_GOOD} expected on a good plane).`);

  if (cv > CV_MARGINAL) verdict = grade(verdict, "poor", reasons, `Point velocities vary by ${pct(cv)} of the mean (coefficient of variation; up to ${pct(CV_GOOD)} expected).`);
  else if (cv > CV_GOOD) verdict = grade(verdict, "marginal", reasons, `Point velocities vary by ${pct(cv)} of the mean (coefficient of variation; up to ${pct(CV_GOOD)} expected).`);

  if (zeroOrNegativeCount > 0) {
    const share = zeroOrNegativeCount / count;
    verdict = grade(
      verdict,
      share > ZERO_SHARE_POOR ? "poor" : "marginal",
      reasons,
      `${zeroOrNegativeCount} of ${count} points read zero or negative velocity pressure (no forward flow, possibly reverse flow or swirl); they count as zero velocity.`,
    );
  }
  if (lowPressureCount > 0) {
    const reason = `${lowPressureCount} of ${count} points read under ${LOW_VELOCITY_PRESSURE_PA} Pa, where the gauge's own error is large.`;
    if (lowPressureCount / count > LOW_SHARE_MARGINAL) verdict = grade(verdict, "marginal", reasons, reason);
    else reasons.push(reason);
  }
  if (reasons.length === 0) reasons.push("Even profile: every criterion within the good band.");
  return { shareAboveTenthOfMax, maxOverMean, cv, zeroOrNegativeCount, lowPressureCount, count, verdict, reasons };
}
