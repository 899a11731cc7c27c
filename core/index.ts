/**
 * The public surface of Statorscope's analysis core: pure functions over bytes, typed arrays
 * and plain data. The CLI, the desktop app's worker and the tests all call these.
 */
export type { Capture, CaptureChannel } from './model/capture.js';
export type { Finding, Severity, SourceLocation } from './model/findings.js';
export { finding } from './model/findings.js';
export { CaptureError, InvariantError } from './model/errors.js';
export type { Role, BaseRole } from './model/roles.js';
export { ROLE_NAMES, parseRole, formatRole } from './model/roles.js';
export type { Analysis, UnitResult, LineResult, UnitAngle } from './model/analysis.js';

export { createCaptureParser, parseCaptureBytes } from './import/captureParser.js';
export type { ImportOptions, ImportResult, CaptureLayout, CaptureParser } from './import/captureParser.js';

export { assignRoles } from './roles/assignRoles.js';
export type { RoleOptions, RoleAssignment, UnitKind } from './roles/assignRoles.js';
export { trackCarrier } from './carrier/trackCarrier.js';
export type { CarrierEstimate } from './carrier/trackCarrier.js';
export type { CarrierTrack } from './carrier/carrierTrack.js';
export { cycleBoundaries, demodulateCycleRange, demodulateCycles, joinCyclePhasors } from './demod/demodulateCycles.js';
export type { CycleDemodulator, CyclePhasors } from './demod/demodulateCycles.js';
export { sinCosFromLines } from './angle/sinCosFromLines.js';
export { solveAngle } from './angle/solveAngle.js';
export { analyzeCapture, type AnalysisEngine } from './pipeline.js';
export type { AnalyzeOptions } from './pipeline.js';

export { analysisToJson, ANALYSIS_SCHEMA } from './report/analysisJson.js';
export type { ReportMeta } from './report/analysisJson.js';
export { anglesToCsv } from './report/anglesCsv.js';
export { formatSummary } from './report/formatSummary.js';
export { renderHtmlReport } from './report/htmlReport.js';

export { synthesizeCapture } from './synth/synthesizeCapture.js';
export type { SynthSpec, SynthUnitSpec, SynthLineSpec, SynthCapture } from './synth/synthesizeCapture.js';
export type { MotionSpec } from './synth/motion.js';
export { formatCaptureCsv, CSV_LAYOUTS } from './synth/formatCaptureCsv.js';
export type { CsvLayoutSpec } from './synth/formatCaptureCsv.js';
