/**
 * The audit: `audit(table, options) -> AuditReport` (everything) and
 * `quickAudit(tableOrProblem, options) -> string[]` (the fast part as warning lines, for eval).
 */
export { audit } from './audit.js';
export { quickAudit, warningLine, type QuickAuditOptions } from './quick-audit.js';
export { renderAuditJson, renderAuditMarkdown } from './render.js';
export { AUDIT_LIMITS, AUDIT_SCHEMA } from './types.js';
export type {
  AuditOptions,
  AuditReport,
  Cluster,
  ColumnProfile,
  DuplicateSummary,
  FeatureScore,
  MissingnessTest,
  Recommendation,
  Severity,
  Suspect,
  SuspectKind,
  TargetProfile,
} from './types.js';
