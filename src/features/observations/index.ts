export { observationLiveEvents, observationQueries, observationsPath } from './api/observations';
export { ObservationsScreen, type ObservationSender } from './components/observations-screen';
