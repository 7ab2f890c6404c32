export { outboxQueries } from './api/outbox-queries';
export { OutboxScreen } from './components/outbox-screen';
