import { useState } from 'react';
import type { CustomerCaseDto } from '@shared/schemas/customer';
import { Form } from '@/components/form/form';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Textarea } from '@/components/ui/textarea';
import { toast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { ManifestSummary } from '@/features/bench';
import { useConfirmFiles } from '../api/confirm-files';
import { disputeFilesInput, useDisputeFiles } from '../api/dispute-files';

/** The recovered files by the kinds the customer said matter, to confirm or to dispute with a note. */
export function FilesReview({ token, page }: { token: string; page: CustomerCaseDto }) {
  const files = page.files!;
  const confirm = useConfirmFiles(token);
  const dispute = useDisputeFiles(token);
  const [disputing, setDisputing] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);

  return (
    <div className="flex flex-col gap-4">
      <ManifestSummary manifest={files} withExamples />
      {files.review.status === 'confirmed' ? (
        <Alert tone="success" title="You confirmed these files">
          {formatDateTime(files.review.at!)}. The lab copies them onto the new media and ships it to you.
        </Alert>
      ) : null}
      {files.review.status === 'disputed' ? (
        <Alert tone="warning" title="You told the lab something is missing">
          “{files.review.note}” The lab looks again and sends an updated list; you will get an e-mail.
        </Alert>
      ) : null}
      {problem ? (
        <Alert tone="danger" live="assertive">
          {problem}
        </Alert>
      ) : null}
      {page.actions.reviewFiles ? (
        disputing ? (
          <Form
            schema={disputeFilesInput}
            defaultValues={{ manifestId: files.id, note: '' }}
            aria-label="Tell the lab what is missing"
            onSubmit={async (values) => {
              await dispute.mutateAsync(values);
              setDisputing(false);
              toast.info('The lab has your note');
            }}
          >
            {({ register, formState: { errors } }) => (
              <>
                <input type="hidden" {...register('manifestId')} />
                <Textarea label="What is missing or damaged?" rows={3} hint="Folder names, dates or file names help the lab find them." error={errors.note?.message} {...register('note')} />
                <div className="flex gap-2">
                  <Button type="submit" isLoading={dispute.isPending}>
                    Send to the lab
                  </Button>
                  <Button variant="secondary" onClick={() => setDisputing(false)}>
                    Back
                  </Button>
                </div>
              </>
            )}
          </Form>
        ) : (
          <div className="flex flex-wrap gap-2">
            <Button
              isLoading={confirm.isPending}
              onClick={async () => {
                setProblem(null);
                try {
                  await confirm.mutateAsync(files.id);
                  toast.success('Thank you: the files are confirmed');
                } catch (error) {
                  if (isApiError(error) && !error.isUnexpected) setProblem(error.message);
                }
              }}
            >
              Yes, what matters is there
            </Button>
            <Button variant="secondary" onClick={() => setDisputing(true)}>
              Something is missing
            </Button>
          </div>
        )
      ) : null}
    </div>
  );
}
