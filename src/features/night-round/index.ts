export { nightRoundLiveEvents, nightRoundQueries } from './api/night-round';
export { NightRound, type NightRoundSender } from './components/night-round';
export type { NightBody } from './lib/night-form';
