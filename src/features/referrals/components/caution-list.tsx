import type { ReactNode } from 'react';
import { Badge, type BadgeTone } from '@/components/ui/badge';
import { cn } from '@/lib/cn';

export interface CautionItem {
  code: string;
  severity: 'info' | 'warning' | 'danger';
  message: string;
  reason?: string;
}

const severity: Record<CautionItem['severity'], { tone: BadgeTone; word: string; box: string }> = {
  danger: { tone: 'danger', word: 'Stop', box: 'border-brick-line bg-brick-bg/60' },
  warning: { tone: 'warning', word: 'Careful', box: 'border-ochre-line bg-ochre-bg/60' },
  info: { tone: 'info', word: 'Note', box: 'border-slate-line bg-slate-bg/60' },
};

const order: Record<CautionItem['severity'], number> = { danger: 0, warning: 1, info: 2 };

/** Most severe first; the same caution from two sources once. */
export function sortCautions(items: readonly CautionItem[]): CautionItem[] {
  const seen = new Set<string>();
  return [...items]
    .filter((item) => (seen.has(item.code) ? false : (seen.add(item.code), true)))
    .sort((a, b) => order[a.severity] - order[b.severity]);
}

/** Handling cautions, each with a word for its severity and, where known, why. */
export function CautionList({ cautions, empty, footer }: { cautions: readonly CautionItem[]; empty?: ReactNode; footer?: ReactNode }) {
  const sorted = sortCautions(cautions);
  return (
    <div>
      {sorted.length === 0 ? (
        empty ? <p className="text-sm text-ink-muted">{empty}</p> : null
      ) : (
        <ul className="flex flex-col gap-2">
          {sorted.map((caution) => (
            <li key={caution.code} className={cn('rounded-control border px-3 py-2.5', severity[caution.severity].box)}>
              <div className="flex items-start gap-2.5">
                <Badge tone={severity[caution.severity].tone} className="mt-0.5">
                  {severity[caution.severity].word}
                </Badge>
                <div className="min-w-0 text-sm">
                  <p className="font-semibold text-ink-strong">{caution.message}</p>
                  {caution.reason ? <p className="mt-0.5 text-ink-muted">Why: {caution.reason}</p> : null}
                </div>
              </div>
            </li>
          ))}
        </ul>
      )}
      {footer ? <p className="mt-3 text-xs text-ink-muted">{footer}</p> : null}
    </div>
  );
}

/** The line under every list of cautions: general rules, the carrier and the law decide. */
export const cautionFootnote =
  'These are general rules from common practice in the trade and do not replace the lab’s advice. For batteries and shipping, the carrier’s rules and local regulations decide.';
