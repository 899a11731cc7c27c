import { describe, expect, it } from 'vitest';
import * as core from '../../core/index.js';

// The public surface of core, listed so that any change to it shows up in review
// (the export-snapshot habit of mljs/spectra-processing).
describe('core public API', () => {
  it('exports exactly these names', () => {
    expect(Object.keys(core).sort()).toMatchInlineSnapshot(`
      [
        "ANALYSIS_SCHEMA",
        "CSV_LAYOUTS",
        "CaptureError",
        "InvariantError",
        "ROLE_NAMES",
        "analysisToJson",
        "analyzeCapture",
        "anglesToCsv",
        "assignRoles",
        "createCaptureParser",
        "cycleBoundaries",
        "demodulateCycleRange",
        "demodulateCycles",
        "finding",
        "formatCaptureCsv",
        "formatRole",
        "formatSummary",
        "joinCyclePhasors",
        "parseCaptureBytes",
        "parseRole",
        "renderHtmlReport",
        "sinCosFromLines",
        "solveAngle",
        "synthesizeCapture",
        "trackCarrier",
      ]
    `);
  });
});
