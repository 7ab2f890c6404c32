export { mapQueries } from './api/farm-status';
export { mapLiveEvents } from './live';
export { FarmMapPanel } from './components/farm-map-panel';
export { FarmUnitList } from './components/farm-unit-list';
export { StatusSummary } from './components/status-summary';
export { useFarmEventStream } from './hooks/use-farm-event-stream';
export { useFarmStatus, useStatusAnnouncements } from './hooks/use-farm-status';
