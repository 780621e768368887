import { useId, useRef, useState, type ReactNode } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { Input } from '@/components/ui/input';

// A secret the server shows once (an API key, a webhook signing secret): created through a form in a
// dialog, then shown with a copy button until the dialog closes, which forgets it.

async function copyText(text: string, fallback: HTMLInputElement | null): Promise<boolean> {
  try {
    await navigator.clipboard.writeText(text);
    return true;
  } catch {
    // Without clipboard access (an http page, a locked-down browser) select the text instead.
    fallback?.select();
    return document.execCommand?.('copy') ?? false;
  }
}

export function ShownOnceSecret({ label, value, copyLabel, warning, children }: { label: string; value: string; copyLabel: string; warning: string; children: ReactNode }) {
  const input = useRef<HTMLInputElement>(null);
  const [copied, setCopied] = useState<'yes' | 'no' | null>(null);
  const statusId = useId();
  return (
    <div className="flex flex-col gap-4">
      <Alert tone="warning" title={warning}>
        {children}
      </Alert>
      <div className="flex items-end gap-2">
        <Input
          ref={input}
          label={label}
          readOnly
          value={value}
          className="min-w-0 flex-1 [&_input]:font-mono [&_input]:text-sm"
          onFocus={(event) => event.currentTarget.select()}
        />
        <Button variant="secondary" aria-describedby={statusId} onClick={async () => setCopied((await copyText(value, input.current)) ? 'yes' : 'no')}>
          {copyLabel}
        </Button>
      </div>
      <p id={statusId} role="status" className="text-sm text-ink-muted">
        {copied === 'yes' ? 'Copied to the clipboard.' : copied === 'no' ? 'Copying was blocked; the text is selected, press Ctrl+C.' : ''}
      </p>
    </div>
  );
}

interface ShownOnceDialogProps<T> {
  openLabel: string;
  title: string;
  createdTitle: string;
  description: string;
  formId: string;
  submitLabel: string;
  isPending: boolean;
  /** The form, given the function to call with what the server created. */
  form: (onCreated: (created: T) => void) => ReactNode;
  shown: (created: T) => ReactNode;
}

export function ShownOnceDialog<T>({ openLabel, title, createdTitle, description, formId, submitLabel, isPending, form, shown }: ShownOnceDialogProps<T>) {
  const [open, setOpen] = useState(false);
  const [created, setCreated] = useState<T | null>(null);
  const close = () => {
    setOpen(false);
    setCreated(null);
  };
  return (
    <>
      <Button onClick={() => setOpen(true)}>{openLabel}</Button>
      <Dialog
        open={open}
        onClose={close}
        title={created ? createdTitle : title}
        description={created ? undefined : description}
        footer={
          created ? (
            <Button onClick={close}>I have copied it</Button>
          ) : (
            <>
              <Button variant="secondary" onClick={close}>
                Cancel
              </Button>
              <Button type="submit" form={formId} isLoading={isPending}>
                {submitLabel}
              </Button>
            </>
          )
        }
      >
        {created ? shown(created) : form(setCreated)}
      </Dialog>
    </>
  );
}
