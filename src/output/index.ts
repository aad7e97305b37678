export * from './atomic.js';
export * from './csv.js';
export * from './ics.js';
export { renderReport } from './report/index.js';
export type { PassSeries, ReportInput } from './report/types.js';
export * from './json.js';
