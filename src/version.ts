/** The tool's version; a test keeps it equal to package.json. */
export const VERSION = '0.1.0';
/** The version of the report format (JSON Schema in schema/report.schema.json). */
export const REPORT_SCHEMA = 'foldwise-report/2';
