export { unitQueries } from './api/unit-queries';
export { unitLiveEvents } from './live';
export { UnitSheet, UnitSummary } from './components/unit-sheet';
export { UnitPage } from './components/unit-page-lazy';
export { chartRanges, isChartRange, type ChartRange } from './lib/ranges';
