export { RefundPanel } from './components/refund-panel';
