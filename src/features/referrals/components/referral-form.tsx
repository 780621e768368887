import { useState } from 'react';
import { useNavigate } from 'react-router';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Checkbox } from '@/components/ui/checkbox';
import { toast } from '@/components/ui/toast';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { useUser } from '@/lib/auth';
import { useMediaQuery } from '@/lib/use-media-query';
import { useCreateReferral } from '../api/create-referral';
import { photoProblems, useUploadPhotos } from '../api/upload-photos';
import { emptyIntake, intakeSchema } from '../utils/intake';
import { IntakeCautions, IntakeRanking } from './intake-guidance';
import {
  BatterySection,
  CustomerSection,
  DeviceSection,
  OriginSection,
  PhotosField,
  PrioritiesSection,
  SensitivitySection,
  SymptomsSection,
} from './intake-fields';

/** The counter intake: the device, what happened, what matters, with live cautions and ranking. */
export function ReferralForm() {
  const user = useUser();
  const navigate = useNavigate();
  const create = useCreateReferral();
  const upload = useUploadPhotos();
  const [files, setFiles] = useState<File[]>([]);
  const problems = photoProblems(files);
  const shopName = user.organization.name;
  // Tailwind's lg breakpoint: beside the form on wide screens, right after "What happened" otherwise.
  const wide = useMediaQuery('(min-width: 64rem)');

  return (
    <Form
      schema={intakeSchema}
      defaultValues={emptyIntake}
      aria-label="New referral"
      onSubmit={async (values) => {
        if (problems.length > 0) return;
        const referral = await create.mutateAsync(values);
        if (files.length > 0) {
          try {
            await upload.mutateAsync({ referralId: referral.id, files });
          } catch (error) {
            // The case is open either way; the photos can be added again from its page.
            if (isApiError(error) && !error.isUnexpected) toast.error('The photos were not added', `${error.message} Add them again from the case page.`);
          }
        }
        toast.success(
          `Referral ${referral.reference} opened`,
          referral.routing.offeredTo
            ? `Offered to ${referral.routing.offeredTo.labName}. You will see here when the lab answers.`
            : 'No lab could be offered it yet; the network team will find one.',
        );
        await navigate(paths.partner.case.getHref(referral.id));
      }}
    >
      {({ register, formState }) => (
        <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_23rem] lg:items-start">
          <div className="flex min-w-0 flex-col gap-6">
            <DeviceSection />
            <SymptomsSection />
            {wide ? null : <IntakeCautions />}
            <BatterySection />
            <PrioritiesSection />
            <SensitivitySection />
            <CustomerSection />
            <OriginSection shopName={shopName} />
            <PhotosField files={files} onChange={setFiles} problems={problems} />
            <IntakeRanking shopName={shopName} />
            <Card title="Customer’s agreement">
              <div className="flex flex-col gap-4">
                <Checkbox
                  label="The customer agrees to the network’s data-handling terms"
                  hint="The lab may open the files to recover and check them; the original device is returned or securely erased at the end, with a certificate."
                  error={formState.errors.consent?.accepted?.message}
                  {...register('consent.accepted')}
                />
                <div className="flex flex-wrap items-center gap-3">
                  <Button type="submit" size="lg" isLoading={formState.isSubmitting}>
                    Open referral
                  </Button>
                  <p className="text-sm text-ink-muted">The best-ranked lab is offered the case at once.</p>
                </div>
              </div>
            </Card>
          </div>
          {wide ? (
            <aside aria-label="Cautions for this device">
              <div className="sticky top-4 flex flex-col gap-6">
                <IntakeCautions />
              </div>
            </aside>
          ) : null}
        </div>
      )}
    </Form>
  );
}
