import { imagingReportInput, labCaseDto, type LabCaseDto } from '@shared/schemas/lab-work';
import type { z } from 'zod';
import { api } from '@/lib/api-client';
import { useLabCaseMutation } from './lab-case-mutation';

export { imagingReportInput };
export type ImagingReportValues = z.output<typeof imagingReportInput>;

export function reportImaging({ id, values }: { id: string; values: ImagingReportValues }): Promise<LabCaseDto> {
  return api.post(`/lab/cases/${encodeURIComponent(id)}/imaging`, { body: values, schema: labCaseDto });
}

export function useReportImaging() {
  return useLabCaseMutation(reportImaging);
}
