export { importQueries } from './api/imports-api';
export { ImportsScreen } from './components/imports-screen';
