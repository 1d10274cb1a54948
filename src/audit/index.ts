/**
 * The audit: `audit(table, options) -> AuditReport` (everything) and
 * `quickSuspects(tableOrProblem, options) -> string[]` (the fast part, one line per finding, for
 * the `audit` field of eval and tune reports) and `quickAudit` (the same as warning lines).
 */
export { audit } from './audit.js';
export { AUDIT_WARNING_PREFIX, quickAudit, quickSuspects, suspectLine, warningLine, type QuickAuditOptions } from './quick-audit.js';
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
