import { useState } from 'react';
import type { LabCaseDto } from '@shared/schemas/lab-work';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { toast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { MANIFEST_MAX_BYTES, useUploadManifest } from '../api/upload-manifest';

/** The recovered-file list as a CSV (path,size,state); problems come back line by line. */
export function ManifestUpload({ labCase }: { labCase: LabCaseDto }) {
  const upload = useUploadManifest();
  const [file, setFile] = useState<File | null>(null);
  const [inputKey, setInputKey] = useState(0);
  const [problems, setProblems] = useState<{ message: string; lines: string[] } | null>(null);
  const tooLarge = file !== null && file.size > MANIFEST_MAX_BYTES;

  return (
    <form
      className="flex flex-col gap-3"
      aria-label="Upload the recovered-file list"
      onSubmit={async (event) => {
        event.preventDefault();
        if (!file || tooLarge) return;
        setProblems(null);
        try {
          await upload.mutateAsync({ id: labCase.id, file });
          setFile(null);
          setInputKey((k) => k + 1);
          toast.success('File list uploaded; the customer has been asked to review it');
        } catch (error) {
          if (isApiError(error) && !error.isUnexpected) setProblems({ message: error.message, lines: error.fields.map((f) => f.message) });
        }
      }}
    >
      <Input
        key={inputKey}
        type="file"
        accept=".csv,text/csv"
        label="Recovered-file list (CSV)"
        hint="Header path,size,state; size in bytes; state intact, partial or unreadable."
        error={tooLarge ? `The file is larger than ${MANIFEST_MAX_BYTES / 1024 / 1024} MB` : undefined}
        onChange={(event) => setFile(event.target.files?.[0] ?? null)}
      />
      {problems ? (
        <Alert tone="danger" live="assertive" title={problems.message}>
          <ul className="list-disc pl-5">
            {problems.lines.map((line) => (
              <li key={line}>{line}</li>
            ))}
          </ul>
        </Alert>
      ) : null}
      <div>
        <Button type="submit" disabled={!file || tooLarge} isLoading={upload.isPending}>
          {labCase.manifest ? 'Upload a new version' : 'Upload the file list'}
        </Button>
      </div>
    </form>
  );
}
