import { formatMoney } from '@shared/domain/money';
import { quoteLineKindLabels, type QuoteDto } from '@shared/schemas/lab-work';
import { labSkillLabels } from '@shared/vocabulary';

/** The quote line by line with its total, as the lab, the shop and the customer read it. */
export function QuoteLines({ quote }: { quote: Pick<QuoteDto, 'lines' | 'totalMinor' | 'currency'> }) {
  return (
    <table className="w-full border-collapse text-left text-sm">
      <caption className="sr-only">Quote lines</caption>
      <thead>
        <tr className="border-b border-ink-hairline text-xs tracking-wide text-ink-muted uppercase">
          <th scope="col" className="py-2 pr-4 font-semibold">
            Item
          </th>
          <th scope="col" className="py-2 text-right font-semibold">
            Amount
          </th>
        </tr>
      </thead>
      <tbody>
        {quote.lines.map((line, i) => (
          <tr key={i} className="border-b border-ink-hairline align-top">
            <td className="py-2 pr-4">
              <span className="block font-medium text-ink-strong">{line.description}</span>
              <span className="block text-xs text-ink-muted">
                {quoteLineKindLabels[line.kind]}
                {line.skill ? ` · ${labSkillLabels[line.skill]}` : ''}
              </span>
            </td>
            <td className="py-2 text-right tabular-nums">{formatMoney(line.amountMinor, quote.currency)}</td>
          </tr>
        ))}
      </tbody>
      <tfoot>
        <tr>
          <th scope="row" className="pt-3 pr-4 text-left font-semibold text-ink-strong">
            Total
          </th>
          <td className="pt-3 text-right text-base font-bold text-ink-strong tabular-nums">{formatMoney(quote.totalMinor, quote.currency)}</td>
        </tr>
      </tfoot>
    </table>
  );
}
