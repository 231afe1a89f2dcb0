/**
 * The tailsift library API. The CLI (cli.ts) is built on exactly these calls.
 */
export { scan, adviseFromLevelTable, toolVersion } from "./commands/scan.js";
export type { ScanOptions } from "./commands/scan.js";
export { readProfile, writeReportFolder } from "./commands/scanCli.js";
export { validateProfile, PROFILE_SCHEMA } from "./profile/schema.js";
export type {
  Profile, ProfileTarget, ProfileSettings, ColumnProfile, ColumnRole, Encoding, LevelFigure, Recommendation, TargetKind,
  PriorWeight, FoldContract,
} from "./profile/types.js";
export { DEFAULT_POLICY } from "./advice/policy.js";
export type { AdvicePolicy } from "./advice/policy.js";
export { recommend } from "./advice/recommend.js";
export { renderTable } from "./render/table.js";
export { renderDecisionRecord } from "./render/markdown.js";
export { renderHtmlReport } from "./render/html.js";
export { TailsiftError } from "./errors.js";
export { runCli, buildProgram } from "./cli.js";
export { levelSql } from "./commands/sql.js";
export { scanLevels } from "./commands/levels.js";
export { redactProfile } from "./profile/redact.js";
export { drift } from "./commands/drift.js";
export type { DriftReport, DriftOptions } from "./commands/drift.js";
export { encode } from "./commands/encode.js";
