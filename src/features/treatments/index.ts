export { treatmentLiveEvents, treatmentQueries } from './api/treatments';
export { TreatmentsScreen } from './components/treatments-screen';
