/**
 * The design layer's public face: scenarios, templates, netlists, runs, metrics, checks, studies and E-series.
 * Pure TypeScript: runs in a Web Worker and in Node alike.
 */
export {
  SCHEMA_VERSION, TEMPLATE_IDS, LOAD_KINDS, PASS_KINDS, STIMULUS_KINDS, scenarioSchema, partsSchema, opampSchema, passSchema,
  loadSchema, stimulusSchema, tolerancesSchema, studiesSchema, ScenarioError, describeIssues,
} from "./schema";
export type { Scenario, TemplateId, Parts, OpampParams, PassParams, LoadParams, Stimulus, Tolerances, SweepAxis } from "./schema";
export { upgradeScenario, tryUpgradeScenario } from "./upgrade";
export { TEMPLATES, templateInfo, defaultScenario } from "./templates";
export type { TemplateInfo, PartSpec } from "./templates";
export { OPAMP_PRESETS, PASS_PRESETS, opampPreset, passPreset } from "./presets";
export {
  compileNetlistJson, NAMES, idealTransconductance, dividerRatio, cableResistance, operatingCommand, loadDrop, thermalVoltage,
} from "./compile";
export type { CompilePurpose, CompileOptions, LoopName } from "./compile";
export type { NetlistJson, NetlistElementJson } from "./netlist";
export {
  stepMetrics, loopMetrics, bandwidth3dB, unwrapDeg, phaseMarginFromDamping, overshootFromDamping, dampingFromOvershoot,
  dampingFromPhaseMargin,
} from "./metrics";
export type { StepMetrics, LoopMetrics } from "./metrics";
export { estimateRinging, matrixPencil, fftPeakHz, crossingSpacing, noiseSigma } from "./ringing";
export type { RingingEstimate } from "./ringing";
export {
  runChecks, accuracyBudget, worstDissipation, dissipationMaximum, junctionTemperature, baseCurrentError, effectiveBeta,
  fullScaleCurrent, driveVoltage,
} from "./checks";
export type { CheckRow, Caution, Verdict, AccuracyBudget, BudgetTerm } from "./checks";
export { eSeries, nearestE, nextUp, nextDown, toleranceBand, eValuesBetween, E_SERIES_NAMES, E_SERIES_TOLERANCE } from "./eseries";
export type { ESeriesName } from "./eseries";
export { createRng, rngForRun, normal, deviation, summarize, histogram } from "./stats";
export type { Summary } from "./stats";
export { demoScenarios } from "./demos";
export type { DemoScenario } from "./demos";
export {
  compileNetlist, runOperatingPoint, runStep, runSmallSignalStep, runLoopGain, runClosedLoop, runOutputImpedance, runDcTransfer, summarizeOp,
  tianLoopGain, hasLocalLoop,
} from "./run";
export type { OperatingPointSummary, StepResult, SmallSignalStep, LoopGainResult, LoopResult, SimOptions } from "./run";
export { runScenario, POLICIES, ANALYSIS_LABELS, AnalysisError } from "./scenario-run";
export type { ScenarioRun, RunPolicy, AnalysisName } from "./scenario-run";
export {
  phaseMarginVerdict, gainMarginVerdict, modulusMarginVerdict, overshootVerdict, judgedOvershootPct, judgedSettling, settlingVerdict, PHASE_MARGIN_PASS_DEG, PHASE_MARGIN_WARN_DEG,
  GAIN_MARGIN_PASS_DB, GAIN_MARGIN_WARN_DB, MODULUS_MARGIN_PASS, MODULUS_MARGIN_WARN,
} from "./verdicts";
export { explainFigures, largeSignalLimits } from "./explain";
export {
  SWEEPABLE_PARAMETERS, getParameter, withParameter, axisValues, sweep1d, map2d, evaluateMetric, spread, spreadScenario, mergeSpread, mergeSweep, mergeMap,
  summarizeSpread, worstCaseCorners, compensate, compensateScan, compensatePick, compensateCandidates, loadCorners,
} from "./studies";
export type {
  StudyOptions, IndexRange, SweepableParameter, SweepResult, SweepPoint, MapResult, MapMetric, SpreadResult, SpreadDraw,
  CompensateSettings, CompensateCandidate, CompensateScanRow, CompensateResult,
} from "./studies";
