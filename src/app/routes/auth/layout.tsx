import { Outlet } from 'react-router';
import { Wordmark } from '@/components/brand/wordmark';

const promises = [
  'Each case goes to the lab that can return the data soonest, with the reasons shown.',
  'Prepaid labels and packing rules for every kind of device.',
  'Shops earn a commission on every paid recovery, settled monthly.',
];

/** The frame for signing in, resetting a password and joining by invitation. */
export default function AuthLayout() {
  return (
    <div className="grid min-h-screen lg:grid-cols-[minmax(0,5fr)_minmax(0,6fr)]">
      <aside aria-label="About Platterpost" className="relative overflow-hidden bg-spruce-900 px-6 py-8 text-paper sm:px-10 lg:py-14">
        <svg aria-hidden="true" viewBox="0 0 400 400" className="pointer-events-none absolute -right-24 -bottom-24 hidden size-[28rem] text-spruce-700 lg:block" fill="none">
          <circle cx="200" cy="200" r="190" stroke="currentColor" strokeWidth="2" />
          <circle cx="200" cy="200" r="150" stroke="currentColor" strokeWidth="1.5" />
          <circle cx="200" cy="200" r="110" stroke="currentColor" strokeWidth="1" />
          <circle cx="200" cy="200" r="70" stroke="currentColor" strokeWidth="1" />
          <circle cx="200" cy="200" r="14" className="fill-copper-500" />
        </svg>
        <div className="relative flex h-full max-w-md flex-col gap-8">
          <Wordmark />
          <div className="lg:mt-auto">
            <p className="text-2xl leading-snug font-semibold sm:text-3xl">Failed drives, sent to the lab that can bring the data back.</p>
            <p className="mt-4 text-spruce-100">
              Platterpost links repair counters with recovery labs. Refer a clicking drive, a drowned phone or an empty
              memory card, ship it safely, and follow it until your customer has their files again.
            </p>
          </div>
          <ul className="hidden flex-col gap-3 text-sm text-spruce-100 lg:flex">
            {promises.map((line) => (
              <li key={line} className="flex items-start gap-3">
                <span aria-hidden="true" className="mt-1.5 size-2 shrink-0 rounded-full bg-copper-400" />
                {line}
              </li>
            ))}
          </ul>
        </div>
      </aside>
      <main id="main" className="flex items-start justify-center px-4 py-10 sm:px-8 lg:items-center">
        <div className="w-full max-w-sm">
          <Outlet />
        </div>
      </main>
    </div>
  );
}
