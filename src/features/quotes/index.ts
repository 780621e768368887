// What other features and routes may use from quotes.
export { QuoteLines } from './components/quote-lines';
export { QuotePanel } from './components/quote-panel';
