/**
 * The statistics layer: small pure functions on plain numbers. SQL computes the sums;
 * these modules compute the formulas. Every public name is listed here explicitly. Every module
 * here is run by the tool (test/stats/reachable.test.ts); reference forms used only to check
 * another module live in test/stats/reference/.
 */
export type { CountOfCounts } from "./types.js";
export type { CountOfCountsSummary } from "./summariseCountOfCounts.js";
export type { BetaBinomialSums } from "./betaBinomialPriorWeight.js";
export type { NormalNormalSums } from "./normalNormalPriorWeight.js";
export type { ScoreGroup, MannWhitneySums } from "./aucFromGroups.js";
export type { PredictionGroup } from "./rSquaredFromGroups.js";

// Count-of-counts: size, diversity, unseen levels
export { normaliseCountOfCounts } from "./normaliseCountOfCounts.js";
export { summariseCountOfCounts } from "./summariseCountOfCounts.js";
export { entropyNats } from "./entropyNats.js";
export { entropyBits } from "./entropyBits.js";
export { effectiveLevels } from "./effectiveLevels.js";
export { goodTuringUnseen } from "./goodTuringUnseen.js";
export { goodTuringUnseenInterval } from "./goodTuringUnseenInterval.js";
export { coverageLevels } from "./coverageLevels.js";
export { rareLevels } from "./rareLevels.js";

// Intervals
export { wilsonInterval } from "./wilsonInterval.js";
export { logGamma } from "./logGamma.js";
export { logBeta, stirlingCorrection } from "./logBeta.js";
export { regularizedIncompleteBeta } from "./regularizedIncompleteBeta.js";
export { regularizedIncompleteGamma } from "./regularizedIncompleteGamma.js";
export { invertConvexTail } from "./invertConvexTail.js";
export { normalQuantile, normalUpperTail, roughNormalQuantile } from "./normalQuantile.js";
export { studentTQuantile } from "./studentTQuantile.js";
export { meanInterval } from "./meanInterval.js";
export { stepMean } from "./stepMean.js";
export { funnelLimits, funnelHalfWidth } from "./funnelLimits.js";
export { expectedFalseFlags } from "./expectedFalseFlags.js";

// Shrinkage / target encoding
export { betaBinomialPriorWeight } from "./betaBinomialPriorWeight.js";
export { mEstimate } from "./mEstimate.js";
export { normalNormalPriorWeight } from "./normalNormalPriorWeight.js";

// Predictive value
export { aucFromGroups, aucFromU, mannWhitneyU } from "./aucFromGroups.js";
export { hanleyMcNeilSE } from "./hanleyMcNeilSE.js";
export { rSquaredFromGroups, rSquaredFromSums } from "./rSquaredFromGroups.js";
export { logLossFromGroups, LOG_LOSS_EPS } from "./logLossFromGroups.js";

// Drift
export { normaliseShares } from "./normaliseShares.js";
export { populationStabilityIndex } from "./populationStabilityIndex.js";

// Hashing
export { checkHashingInputs } from "./checkHashingInputs.js";
export { expectedBucketsUsed } from "./expectedBucketsUsed.js";
export { expectedCollidingLevels } from "./expectedCollidingLevels.js";

// Effect sizes and nested priors (moved here from drift/ and evidence/: statistics live in stats/)
export { cohensH, cohensD } from "./effectSize.js";
export { nestedPriorWeight } from "./nestedPriorWeight.js";
export type { NestedSums } from "./nestedPriorWeight.js";
