/**
 * Public surface of app/analysis (pure TypeScript: no I/O, no DOM, no Node
 * built-ins; deterministic). The renderer and the CLI import from here.
 */
export { AnalysisError } from './analysis-error.ts';
export { summarizeAnalysis } from './analysis-summary.ts';
export { analyzeTable, parseFitSpec, type AnyAnalysis, type TableAnalysisOptions } from './analyze-table.ts';
export {
  deviationAt,
  octaveFactors,
  oadevDirect,
  phaseFromFrequency,
  stability,
  type StabilityKind,
  type StabilityPoint,
} from './allan.ts';
export {
  CsvError,
  detectCsvKind,
  driftInputFromTable,
  numericColumn,
  pushingInputFromTable,
  sweepInputFromTable,
  type CsvKind,
} from './csv-columns.ts';
export {
  buildDatasheet,
  DatasheetInputError,
  dutStem,
  type Datasheet,
  type DatasheetOptions,
  type DatasheetRow,
  type DatasheetRun,
  type RunConditions,
  type RunOrigin,
} from './datasheet.ts';
export { displayRow, renderDatasheetCsv, renderDatasheetHtml, renderDatasheetMarkdown } from './datasheet-render.ts';
export { analyzeDrift, type DriftAnalysis, type DriftInput, type DriftOptions } from './drift-analysis.ts';
export { frequencyTemperatureLoop, type FtLoop } from './drift-loop.ts';
export {
  formatDuration,
  formatNumber,
  formatPlain,
  formatSi,
  formatSiWithUncertainty,
  siPrefixFor,
} from './format-si.ts';
export { belowFloor, formatFigure, formatSignificance, isSignificant, type FigureOptions } from './format-figure.ts';
export { loopOperatingPoint, type KvcoCorner, type OperatingPoint } from './loop-operating-point.ts';
export { qualityWarnings, runQuality, type RunEventLike, type RunQuality } from './run-quality.ts';
export { fitSpline, splineSlope, splineSlopeSd, splineValue, splineValueSd, type SplineFit } from './spline-fit.ts';
export { polyModel, splineModel, type TuningModel } from './tuning-model.ts';
export { designLoopFilter, type LoopDesign, type LoopFilter, type LoopSpec } from './loop-filter.ts';
export {
  evaluateLoop,
  logFrequencies,
  loopAcrossKvco,
  openLoopAt,
  openLoopResponse,
  type LoopCheck,
  type LoopParams,
} from './loop-filter-eval.ts';
export { loopFromSweep, type LoopFromSweep } from './loop-filter-sweep.ts';
export { fitPolynomialAuto, type AutoFitResult } from './poly-fit-auto.ts';
export { derivativeStdDev, evalPoly, evalPolyDerivative, fitPolynomial, type PolyFit } from './poly-fit.ts';
export { analyzePushing, type PushingAnalysis, type PushingInput } from './pushing-analysis.ts';
export { analyzeSweep, type SweepOptions } from './sweep-analysis.ts';
export { groupPoints, isNoOscillation, type Direction, type PointSet, type SweepInput } from './sweep-points.ts';
export type { SweepAnalysis } from './sweep-types.ts';
