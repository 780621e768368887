import { useFieldArray } from 'react-hook-form';
import { formatMoney } from '@shared/domain/money';
import { dollarsToCents, QUOTE_CURRENCY, quoteLineKindLabels, type LabCaseDto, type QuoteFormValues } from '@shared/schemas/lab-work';
import { labSkillLabels, labSkills } from '@shared/vocabulary';
import { Form, type FormMethods } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Textarea } from '@/components/ui/textarea';
import { toast } from '@/components/ui/toast';
import { quoteFormSchema, toSendQuoteInput, useSendQuote } from '../api/send-quote';

const skillOptions = labSkills.map((s) => ({ value: s, label: labSkillLabels[s] }));

function defaults(labCase: LabCaseDto): QuoteFormValues {
  const current = labCase.quote;
  if (current) {
    return {
      lines: current.lines.map((l) => ({ kind: l.kind, skill: l.skill ?? '', description: l.description, amount: (l.amountMinor / 100).toFixed(2) })),
      note: current.note ?? '',
    };
  }
  return {
    lines: [
      ...labCase.requiredSkills.map((skill) => ({ kind: 'service' as const, skill, description: labSkillLabels[skill], amount: '' })),
      { kind: 'target_media', skill: '', description: '', amount: '' },
      { kind: 'return_shipping', skill: '', description: 'Return shipping, signature on delivery', amount: '' },
    ],
    note: '',
  };
}

/** The lab manager's quote: work by skill, new media for the data, return shipping and an optional expedite line. */
export function QuoteForm({ labCase, onSent }: { labCase: LabCaseDto; onSent?: () => void }) {
  const send = useSendQuote();
  return (
    <Form
      schema={quoteFormSchema}
      defaultValues={defaults(labCase)}
      aria-label="Quote"
      onSubmit={async (values) => {
        await send.mutateAsync({ id: labCase.id, values: toSendQuoteInput(values) });
        toast.success('Quote sent', 'The customer has an e-mail with the private link to approve it.');
        onSent?.();
      }}
    >
      {(form) => <QuoteFields form={form} revising={labCase.quote !== null} pending={send.isPending} />}
    </Form>
  );
}

function QuoteFields({ form, revising, pending }: { form: FormMethods<typeof quoteFormSchema>; revising: boolean; pending: boolean }) {
  const {
    register,
    control,
    watch,
    formState: { errors },
  } = form;
  const { fields, append, remove } = useFieldArray({ control, name: 'lines' });
  const lines = watch('lines');
  const total = lines.reduce((sum, l) => sum + (dollarsToCents(l.amount ?? '') ?? 0), 0);
  const hasExpedite = lines.some((l) => l.kind === 'expedite');
  const linesError = errors.lines?.root?.message ?? errors.lines?.message;

  return (
    <>
      <fieldset className="flex flex-col gap-4">
        <legend className="text-sm font-semibold text-ink-strong">Lines</legend>
        {linesError ? <p className="text-sm text-brick-text">{linesError}</p> : null}
        {fields.map((field, i) => {
          const kind = lines[i]?.kind ?? field.kind;
          return (
            <div key={field.id} className="flex flex-col gap-3 rounded-control border border-ink-hairline p-3">
              <input type="hidden" {...register(`lines.${i}.kind` as const)} />
              <div className="flex flex-wrap items-end justify-between gap-3">
                {kind === 'service' ? (
                  <Select
                    label="Recovery work: skill"
                    className="w-full sm:w-72"
                    options={skillOptions}
                    placeholder="Choose a skill"
                    error={errors.lines?.[i]?.skill?.message}
                    {...register(`lines.${i}.skill` as const)}
                  />
                ) : (
                  <p className="text-sm font-semibold text-ink-strong">{quoteLineKindLabels[kind]}</p>
                )}
                {kind === 'service' || kind === 'expedite' ? (
                  <Button variant="ghost" size="sm" onClick={() => remove(i)} aria-label={`Remove line ${i + 1}`}>
                    Remove
                  </Button>
                ) : null}
              </div>
              <div className="grid gap-3 sm:grid-cols-[minmax(0,1fr)_9rem]">
                <Input
                  label="Description"
                  placeholder={kind === 'target_media' ? 'e.g. 1 TB USB 3.2 external drive' : undefined}
                  error={errors.lines?.[i]?.description?.message}
                  {...register(`lines.${i}.description` as const)}
                />
                <Input label="Amount (USD)" inputMode="decimal" placeholder="0.00" error={errors.lines?.[i]?.amount?.message} {...register(`lines.${i}.amount` as const)} />
              </div>
            </div>
          );
        })}
        <div className="flex flex-wrap gap-2">
          <Button variant="secondary" size="sm" onClick={() => append({ kind: 'service', skill: '', description: '', amount: '' })}>
            Add a work line
          </Button>
          {!hasExpedite ? (
            <Button variant="secondary" size="sm" onClick={() => append({ kind: 'expedite', skill: '', description: 'Expedited service', amount: '' })}>
              Add expedite
            </Button>
          ) : null}
        </div>
      </fieldset>
      <Textarea label="Note for the customer" optional rows={2} error={errors.note?.message} {...register('note')} />
      <div className="flex flex-wrap items-center justify-between gap-3 border-t border-ink-hairline pt-4">
        <p className="text-sm text-ink">
          The customer pays <span className="font-bold text-ink-strong">{formatMoney(total, QUOTE_CURRENCY)}</span>. The network adds nothing to this price.
        </p>
        <Button type="submit" isLoading={pending}>
          {revising ? 'Send the revised quote' : 'Send the quote'}
        </Button>
      </div>
    </>
  );
}
