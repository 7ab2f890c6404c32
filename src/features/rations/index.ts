export { rationQueries } from './api/ration-queries';
export { OverrideForm, type OverrideTarget } from './components/override-form';
export { RationSheet } from './components/ration-sheet';
export { RationsScreen, type RationView } from './components/rations-screen';
export { isDay } from './lib/format';
export { rationLiveEvents } from './live';
