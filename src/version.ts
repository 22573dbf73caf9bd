/** The tool's version, recorded in every report and study for provenance (kept equal to package.json). */
export const TOOL_VERSION = '0.1.0';
