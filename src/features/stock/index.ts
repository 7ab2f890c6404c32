export { stockQueries } from './api/stock-queries';
export { StockScreen } from './components/stock-screen';
export { stockLiveEvents } from './live';
