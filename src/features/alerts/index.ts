export { alertQueries } from './api/alert-queries';
export { useAcknowledgeAlert, useAssignAlert, useResolveAlert } from './api/alert-mutations';
export { AlertCard } from './components/alert-card';
export { AlertList, UnitAlerts } from './components/alert-list';
export { alertTabs, AlertsScreen, type AlertTab } from './components/alerts-screen';
export { alertLiveEvents } from './live';
