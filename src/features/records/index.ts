export { recordQueries } from './api/records-queries';
export { RecordsScreen } from './components/records-screen';
