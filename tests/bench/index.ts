import { benchPartnerApiLoad } from './partner-api-load';
import { benchRouting } from './routing';
import { benchSettlement } from './settlement';
import { benchShipping } from './shipping';

// `npm run bench [-- routing shipping settlement load]`: prints speed figures; nothing here is
// asserted in the test suite. With no names, every benchmark runs.
const benches: Record<string, () => unknown> = {
  routing: benchRouting,
  shipping: benchShipping,
  settlement: benchSettlement,
  load: benchPartnerApiLoad,
};
const wanted = process.argv.slice(2).filter((a) => a in benches);
console.log('Platterpost benchmarks\n');
for (const [name, bench] of Object.entries(benches)) {
  if (wanted.length === 0 || wanted.includes(name)) await bench();
}
