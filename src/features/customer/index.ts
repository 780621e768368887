// What other features and routes may use from the customer's side.
export { ShopLabWork } from './components/shop-lab-work';
