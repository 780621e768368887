import type { CustomerCaseDto } from '@shared/schemas/customer';
import { cn } from '@/lib/cn';

// The customer's case in seven plain steps; the current one is marked for screen readers too.

const steps = [
  { label: 'On its way to the lab', statuses: ['opened', 'needs_attention', 'offered', 'accepted', 'label_issued', 'in_transit'] },
  { label: 'Examined', statuses: ['received', 'evaluating'] },
  { label: 'Quote', statuses: ['quote_sent', 'quote_declined'] },
  { label: 'Payment', statuses: ['approved'] },
  { label: 'Recovery', statuses: ['paid', 'recovering'] },
  { label: 'Your files', statuses: ['ready_for_review'] },
  { label: 'Back to you', statuses: ['returned', 'closed'] },
] as const;

export function CaseSteps({ status }: { status: CustomerCaseDto['status'] }) {
  const current = steps.findIndex((s) => (s.statuses as readonly string[]).includes(status));
  if (current < 0) return null;
  return (
    <ol aria-label="Steps of your recovery" className="grid grid-cols-2 gap-2 sm:grid-cols-7">
      {steps.map((step, i) => (
        <li
          key={step.label}
          aria-current={i === current ? 'step' : undefined}
          className={cn(
            'rounded-control border px-2 py-2 text-center text-xs font-semibold',
            i < current && 'border-spruce-200 bg-spruce-50 text-spruce-800',
            i === current && 'border-copper-500 bg-paper-raised text-ink-strong shadow-panel',
            i > current && 'border-ink-hairline bg-paper text-ink-muted',
          )}
        >
          <span className="sr-only">{i < current ? 'Done: ' : i === current ? 'Now: ' : 'Later: '}</span>
          {step.label}
        </li>
      ))}
    </ol>
  );
}
