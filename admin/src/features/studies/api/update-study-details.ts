import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { minorToMajorText, parseMajorAmount } from '@/lib/money';
import { studyKeys } from '@/lib/study-keys';
import { studiesKey } from './get-studies';
import type { Study } from './get-study';

export type UpdateStudyBody = components['schemas']['UpdateStudyDto'];

/** The edit form's fields, as typed. */
export interface StudyDetailsFormValues {
  title: string;
  summary: string;
  contactEmail: string;
  protocolNumber: string;
  ethicsApprovalReference: string;
  targetSize: string;
  budget: string;
}

export function detailsFormValues(study: Study): StudyDetailsFormValues {
  return {
    title: study.title,
    summary: study.summary,
    contactEmail: study.contactEmail ?? '',
    protocolNumber: study.protocolNumber ?? '',
    ethicsApprovalReference: study.ethicsApprovalReference ?? '',
    targetSize: study.targetSize === null ? '' : String(study.targetSize),
    budget: minorToMajorText(study.budgetMinor, study.currency),
  };
}

/**
 * The api's rules for details (api/src/studies/study-edit-rules.ts), checked here first so each field says what is wrong
 * before anything is sent: after the first assignment the budget may not fall and the target may not go below those assigned.
 */
export function studyDetailsSchema(study: Study) {
  const assigned = study.assignedCount;
  return z
    .object({
      title: z.string().trim().min(1, 'Enter a title.').max(200, 'Keep the title under 200 characters.'),
      summary: z.string().trim().max(4000, 'Keep the description under 4,000 characters.'),
      contactEmail: z
        .string()
        .trim()
        .refine(
          (text) => text === '' || z.email().safeParse(text).success,
          'Enter a valid e-mail address, like study-team@lab.org.',
        ),
      protocolNumber: z.string().trim().max(80, 'Keep the protocol reference under 80 characters.'),
      ethicsApprovalReference: z.string().trim().max(80, 'Keep the approval reference under 80 characters.'),
      targetSize: z
        .string()
        .trim()
        .refine((text) => text === '' || (/^\d+$/.test(text) && Number(text) >= 1 && Number(text) <= 1_000_000), {
          message: 'Enter the target as a whole number from 1 to 1,000,000.',
        })
        .refine((text) => text === '' || Number(text) >= assigned, {
          message: `${assigned} ${assigned === 1 ? 'person is' : 'people are'} already assigned, so the target cannot be lower.`,
        }),
      budget: z.string().trim(),
    })
    .superRefine((values, ctx) => {
      const amount = parseMajorAmount(values.budget === '' ? '0' : values.budget, study.currency);
      if (!amount.ok) ctx.addIssue({ code: 'custom', path: ['budget'], message: amount.message });
      else if (assigned > 0 && amount.minor < study.budgetMinor) {
        ctx.addIssue({
          code: 'custom',
          path: ['budget'],
          message: 'People are already assigned, so the budget may be raised but not lowered.',
        });
      }
    });
}

/** Only what changed goes to the api, so a fixed field left as it was never trips a rule. */
export function changedDetails(study: Study, values: StudyDetailsFormValues): UpdateStudyBody {
  const before = detailsFormValues(study);
  const body: UpdateStudyBody = {};
  const trimmed = (text: string) => text.trim();
  if (trimmed(values.title) !== before.title) body.title = trimmed(values.title);
  if (trimmed(values.summary) !== before.summary) body.summary = trimmed(values.summary);
  if (trimmed(values.contactEmail) !== before.contactEmail && trimmed(values.contactEmail) !== '')
    body.contactEmail = trimmed(values.contactEmail);
  if (trimmed(values.protocolNumber) !== before.protocolNumber) body.protocolNumber = trimmed(values.protocolNumber);
  if (trimmed(values.ethicsApprovalReference) !== before.ethicsApprovalReference)
    body.ethicsApprovalReference = trimmed(values.ethicsApprovalReference);
  if (trimmed(values.targetSize) !== before.targetSize && trimmed(values.targetSize) !== '')
    body.targetSize = Number(values.targetSize);
  const budget = parseMajorAmount(values.budget.trim() === '' ? '0' : values.budget, study.currency);
  if (budget.ok && budget.minor !== study.budgetMinor) body.budgetMinor = budget.minor;
  return body;
}

export async function updateStudyDetails(studyId: string, body: UpdateStudyBody): Promise<Study> {
  return unwrap(apiClient.PATCH('/api/studies/{studyId}', { params: { path: { studyId } }, body }));
}

export function useUpdateStudyDetails(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: UpdateStudyBody) => updateStudyDetails(studyId, body),
    onSuccess: async (study) => {
      queryClient.setQueryData(studyKeys.detail(studyId), study);
      await queryClient.invalidateQueries({ queryKey: studiesKey });
    },
  });
}
