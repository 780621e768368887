import { benchRouting } from './routing';
import { benchShipping } from './shipping';
import { benchSettlement } from './settlement';

// `npm run bench`: prints speed figures; nothing here is asserted in the test suite.
console.log('Platterpost benchmarks\n');
benchRouting();
await benchShipping();
await benchSettlement();
