export { setupQueries } from './api/setup-queries';
export { SecretDialog } from './components/probes/secret-dialog';
export { SetupScreen, setupTabs, type SetupTab } from './components/setup-screen';
