import { Wordmark } from '@/components/brand/wordmark';
import { Card } from '@/components/ui/card';

// The customer has no account: this page is reached only through the private link the
// shop hands over, and will show that one case and nothing else.
export default function CustomerCasePage() {
  return (
    <div className="flex min-h-screen flex-col">
      <header className="bg-spruce-900 px-6 py-4 text-paper">
        <Wordmark />
      </header>
      <main id="main" className="mx-auto w-full max-w-2xl flex-1 px-4 py-10">
        <title>Your recovery · Platterpost</title>
        <h1 className="text-2xl font-bold tracking-tight text-ink-strong sm:text-3xl">Your data recovery</h1>
        <p className="mt-2 text-ink-muted">
          This private page belongs to one recovery case. Keep the link to yourself: anyone who has it can see the case.
        </p>
        <Card title="What will appear here" className="mt-6">
          <ul className="flex list-disc flex-col gap-2 pl-5 text-sm">
            <li>Where your device is now, and each step since your repair shop sent it.</li>
            <li>The lab’s quote, to approve or decline, and a secure payment page.</li>
            <li>The list of recovered files, so you can check the ones that matter are there.</li>
            <li>The address your data should be sent back to.</li>
          </ul>
        </Card>
      </main>
    </div>
  );
}
