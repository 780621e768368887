import { useMemo } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import { labSkillLabels } from '@shared/vocabulary';
import { PanelError } from '@/components/errors/error-panel';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { useDebouncedValue } from '@/lib/use-debounced-value';
import { useRoutingPreview } from '../api/preview-routing';
import { liveCautions, previewInputFrom, type IntakeFormValues } from '../utils/intake';
import { CautionList, cautionFootnote } from './caution-list';
import { RoutingOverview } from './routing-overview';

/**
 * The cautions for this device as the clerk fills the form, worked out in the browser by
 * the same triage and battery rules the server applies.
 */
export function IntakeCautions() {
  const { control } = useFormContext<IntakeFormValues>();
  const values = useWatch({ control });
  const live = useMemo(() => liveCautions(values), [values]);

  return (
    <Card title="Handle with care" description="What to do, and not do, with this device before it ships.">
      <div aria-live="polite" className="flex flex-col gap-4">
        {live.triage === null ? (
          <p className="text-sm text-ink-muted">Choose the kind of device. The cautions for it, and for what happened to it, appear here as you fill in the form.</p>
        ) : (
          <>
            {live.battery?.contactLabFirst ? (
              <Alert tone="danger" title="Fire risk: contact the lab before the box ships">
                Keep the device switched off and away from heat. The lab’s name and contact appear on the case page once a lab accepts it.
              </Alert>
            ) : null}
            {live.battery && !live.battery.shippable ? (
              <Alert tone="danger" title="This battery cannot ship through the network">
                Contact the lab through the case page to arrange another way.
              </Alert>
            ) : live.battery && !live.battery.airAllowed ? (
              <Alert tone="warning" title="No air transport">
                Only ground services may carry this box.
              </Alert>
            ) : null}
            <CautionList cautions={live.cautions} empty="No special cautions for this device. Pack it as the packing rules say." footer={cautionFootnote} />
            <div className="border-t border-ink-hairline pt-3 text-sm">
              <p className="font-semibold text-ink-strong">The lab will need</p>
              <ul className="mt-1 list-disc pl-5 text-ink">
                {live.triage.requiredSkills.map((skill) => (
                  <li key={skill}>{labSkillLabels[skill]}</li>
                ))}
                {live.triage.needsCleanAir ? <li>A certified clean-air bench (ISO class 5 or cleaner)</li> : null}
                {live.triage.needsHealthDataAgreement ? <li>The network’s health-data agreement</li> : null}
              </ul>
            </div>
          </>
        )}
      </div>
    </Card>
  );
}

/** The labs the network would offer this case to, refreshed a moment after the clerk stops typing. */
export function IntakeRanking({ shopName }: { shopName: string }) {
  const { control } = useFormContext<IntakeFormValues>();
  const values = useWatch({ control });
  const input = useMemo(() => previewInputFrom(values), [values]);
  const settled = useDebouncedValue(input, 450);
  const preview = useRoutingPreview(settled);
  const originName = values.shipsFrom === 'elsewhere' ? 'Pick-up address' : shopName;

  return (
    <Card title="Where the case would go" description="Labs with every skill this device needs, ranked by how soon the customer would have data back.">
      {settled === null ? (
        <p className="text-sm text-ink-muted">Choose the kind of device to see which labs would be offered this case.</p>
      ) : preview.isPending ? (
        <Spinner label="Ranking labs for this device" />
      ) : preview.isError && !preview.data ? (
        <PanelError title="The labs could not be ranked just now" onRetry={() => void preview.refetch()}>
          You can still open the referral; the network ranks the labs again when it is opened.
        </PanelError>
      ) : preview.data ? (
        <RoutingOverview
          routing={preview.data.routing}
          originName={originName}
          title="Labs for this device"
          headingLevel={3}
          updating={preview.isFetching || JSON.stringify(input) !== JSON.stringify(settled)}
          emptyText="No lab can take this case right now. You can still open it: the network team will find a lab and tell you."
        />
      ) : null}
    </Card>
  );
}
