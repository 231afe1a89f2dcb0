/**
 * The statistics layer: small pure functions on plain numbers. SQL computes the sums;
 * these modules compute the formulas. Every public name is listed here explicitly.
 */
export type { CountOfCounts } from "./types.js";
export type { CountOfCountsSummary } from "./summariseCountOfCounts.js";
export type { BetaBinomialSums } from "./betaBinomialSums.js";
export type { NormalNormalSums } from "./normalNormalPriorWeight.js";
export type { ScoreGroup } from "./aucFromGroups.js";
export type { PredictionGroup } from "./rSquaredFromGroups.js";

// Count-of-counts: size, diversity, unseen levels
export { normaliseCountOfCounts } from "./normaliseCountOfCounts.js";
export { summariseCountOfCounts } from "./summariseCountOfCounts.js";
export { entropyNats } from "./entropyNats.js";
export { entropyBits } from "./entropyBits.js";
export { effectiveLevels } from "./effectiveLevels.js";
export { inverseSimpson } from "./inverseSimpson.js";
export { entropyOfProportions } from "./entropyOfProportions.js";
export { goodTuringUnseen } from "./goodTuringUnseen.js";
export { goodTuringUnseenInterval } from "./goodTuringUnseenInterval.js";
export { chao1 } from "./chao1.js";
export { chao1BiasCorrected } from "./chao1BiasCorrected.js";
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
export { funnelLimits } from "./funnelLimits.js";
export { expectedFalseFlags } from "./expectedFalseFlags.js";

// Shrinkage / target encoding
export { betaBinomialSums } from "./betaBinomialSums.js";
export { betaBinomialPriorWeight } from "./betaBinomialPriorWeight.js";
export { jamesSteinShrinkage } from "./jamesSteinShrinkage.js";
export { mEstimate } from "./mEstimate.js";
export { blendWeight } from "./blendWeight.js";
export { derSimonianLaird } from "./derSimonianLaird.js";
export { normalNormalPriorWeight } from "./normalNormalPriorWeight.js";

// Predictive value
export { aucFromGroups } from "./aucFromGroups.js";
export { AucAccumulator } from "./aucAccumulator.js";
export { hanleyMcNeilSE } from "./hanleyMcNeilSE.js";
export { rSquaredFromGroups } from "./rSquaredFromGroups.js";
export { RSquaredAccumulator } from "./rSquaredAccumulator.js";
export { logLossFromGroups } from "./logLossFromGroups.js";

// Drift
export { normaliseShares } from "./normaliseShares.js";
export { klDivergence } from "./klDivergence.js";
export { populationStabilityIndex } from "./populationStabilityIndex.js";

// Hashing
export { checkHashingInputs } from "./checkHashingInputs.js";
export { expectedBucketsUsed } from "./expectedBucketsUsed.js";
export { expectedCollidingLevels } from "./expectedCollidingLevels.js";
export { birthdayCollisionProbability } from "./birthdayCollisionProbability.js";

// Effect sizes and nested priors (moved here from drift/ and evidence/: statistics live in stats/)
export { cohensH, cohensD } from "./effectSize.js";
export { nestedPriorWeight } from "./nestedPriorWeight.js";
export type { NestedSums } from "./nestedPriorWeight.js";
