/**
 * The quick audit's suspects on standard error, for eval and tune: each as one
 * `foldwise: warning: audit: <kind>: <evidence>; <action>` line (line breaks in the text become
 * spaces), printed before the report's other warnings. Reports keep the suspects apart from the
 * warnings (`audit`); on standard error each reads as it did when it was a warning.
 */
import { AUDIT_WARNING_PREFIX } from '../audit/quick-audit.js';
import type { ReportAudit } from '../model/report.js';
import type { Io } from './io.js';

export function printAuditSuspects(io: Io, audit: ReportAudit | undefined): void {
  for (const s of audit?.suspects ?? []) io.stderr.write(`foldwise: warning: ${AUDIT_WARNING_PREFIX}${s.replace(/\r?\n|\r/g, ' ')}\n`);
}
