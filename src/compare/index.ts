/** Paired comparison of learners on identical folds, report matching and the gate rule. */
export type * from '../model/compare.js';
export { pairFolds, foldScore, type FoldPairing, type FoldKey } from './pair-folds.js';
export { pairedStats, directionOf } from './paired-stats.js';
export { baselineOf, bestBy, findLearner, summaryMean } from './select.js';
export { reportComparisons, withComparisons, COMPARISON_LEVEL } from './within-report.js';
export { describeDifferences, NotComparableError, reportDifferences, versionWarning, type ReportDifference } from './match-reports.js';
export { readReport, schemaPath, type LoadedReport } from './read-report.js';
export { checkGateRuleOptions, pairedGateTest, unpairedGateTest, type GateRuleOptions, type GateTest } from './gate-rule.js';
export { DEFAULT_ALPHA, DEFAULT_MAX_DROP, GATE_SCHEMA, gateReports, type GateOptions } from './gate.js';
export { compareReports, type CompareOptions } from './compare-reports.js';
export { pValue, renderCompareMarkdown, renderGateMarkdown, renderNotComparableMarkdown, signed } from './render.js';
