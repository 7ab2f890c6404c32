export { reportQueries } from './api/report-queries';
export { MorningReportView } from './components/morning-report';
export { isDay } from './lib/day';
export { reportLiveEvents } from './live';
