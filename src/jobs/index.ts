export { runScenario, formatRunSummary, defaultOutDir, type RunOptions, type RunResult } from './run.js';
export { maskScenario, rateScenario, formatMaskResult, formatRateResult, type MaskResult, type RateResult } from './finders.js';
export { rebuildReport, loadReportInput } from './report.js';
export { stepColumns, PASS_COLUMNS, DAILY_COLUMNS, CAUTIONS, MODELS_USED } from './outputs.js';
export { estimateRunSize, formatRunSize, timeInViewFraction, type RunSize } from './runSize.js';
export { elementAgeScenario, formatElementAgeResult, elementAges, withElementAge, AGE_COLUMNS, type ElementAgeResult, type ElementAgePoint } from './age.js';
export { planScenario, type PlanResult } from './plan.js';
