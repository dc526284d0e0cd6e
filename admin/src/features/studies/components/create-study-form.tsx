import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { RadioCards } from '@/components/ui/radio-cards';
import { Notice } from '@/components/ui/states';
import { SwitchField } from '@/components/ui/switch-field';
import { TextAreaField } from '@/components/ui/text-area-field';
import { TextField } from '@/components/ui/text-field';
import { applyApiFieldErrors } from '@/lib/form-field-errors';
import {
  createStudyInputSchema,
  suggestSlug,
  useCreateStudy,
  type CreateStudyBody,
  type CreateStudyFormValues,
} from '../api/create-study';
import type { Study } from '../api/get-study';

// The api names the budget `budgetMinor`; the form asks for major units.
const apiToFormField: Record<string, keyof CreateStudyFormValues> = {
  slug: 'slug',
  title: 'title',
  protocolNumber: 'protocolNumber',
  design: 'design',
  summary: 'summary',
  estimatedMinutes: 'estimatedMinutes',
  targetSize: 'targetSize',
  budgetMinor: 'budget',
  currency: 'currency',
  blinded: 'blinded',
  labName: 'labName',
  contactEmail: 'contactEmail',
};

const designOptions = [
  {
    value: 'between',
    label: 'Between subjects',
    description:
      'Each participant takes part in one condition. Evenhand assigns the condition when they sign the consent form.',
  },
  {
    value: 'within',
    label: 'Within subjects',
    description:
      'Each participant tries every condition, in an order Evenhand assigns so that order effects balance out.',
  },
] as const;

export interface CreateStudyFormProps {
  onCreated: (study: Study) => void;
  onCancel: () => void;
  defaultLabName?: string;
}

export function CreateStudyForm({ onCreated, onCancel, defaultLabName = '' }: CreateStudyFormProps) {
  const createStudy = useCreateStudy();
  const [slugEdited, setSlugEdited] = useState(false);
  const {
    register,
    control,
    handleSubmit,
    setError,
    setValue,
    formState: { errors },
  } = useForm<CreateStudyFormValues, unknown, CreateStudyBody>({
    resolver: zodResolver(createStudyInputSchema),
    defaultValues: {
      title: '',
      slug: '',
      protocolNumber: '',
      summary: '',
      estimatedMinutes: '',
      targetSize: '',
      budget: '',
      currency: 'USD',
      blinded: true,
      labName: defaultLabName,
      contactEmail: '',
    },
  });

  const title = register('title', {
    onChange: (event: React.ChangeEvent<HTMLInputElement>) => {
      if (!slugEdited) setValue('slug', suggestSlug(event.target.value));
    },
  });
  const slug = register('slug', { onChange: () => setSlugEdited(true) });

  const onSubmit = handleSubmit((body) => {
    createStudy.mutate(body, {
      onSuccess: (study) => onCreated(study),
      onError: (error) => applyApiFieldErrors(error, setError, (field) => apiToFormField[field] ?? null),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate aria-label="New study" className="flex flex-col gap-6">
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}

      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-sm font-semibold text-ink">About the study</legend>
        <TextField
          label="Title"
          autoComplete="off"
          error={errors.title?.message}
          className="sm:col-span-2"
          {...title}
        />
        <TextField
          label="Link name"
          autoComplete="off"
          hint="Part of the study’s web address for participants; lower-case letters, digits and dashes."
          error={errors.slug?.message}
          {...slug}
        />
        <TextField
          label="Protocol reference"
          autoComplete="off"
          hint="The lab’s own protocol number, e.g. HLCL-2026-014; the ethics board’s approval reference goes under Edit details once the study exists."
          error={errors.protocolNumber?.message}
          {...register('protocolNumber')}
        />
        <TextAreaField
          label="Summary for participants"
          hint="What taking part involves, in plain words. Shown on the study page."
          error={errors.summary?.message}
          className="sm:col-span-2"
          {...register('summary')}
        />
        <TextField
          label="Lab name"
          autoComplete="organization"
          error={errors.labName?.message}
          {...register('labName')}
        />
        <TextField
          label="Contact e-mail"
          type="email"
          autoComplete="off"
          hint="Where participants can write with questions."
          error={errors.contactEmail?.message}
          {...register('contactEmail')}
        />
      </fieldset>

      <fieldset className="flex flex-col gap-4">
        <legend className="mb-2 text-sm font-semibold text-ink">Design</legend>
        <Controller
          control={control}
          name="design"
          render={({ field, fieldState }) => (
            <RadioCards
              label="How conditions are compared"
              value={field.value}
              onChange={field.onChange}
              options={designOptions}
              error={fieldState.error?.message}
              columns={2}
            />
          )}
        />
        <Controller
          control={control}
          name="blinded"
          render={({ field }) => (
            <SwitchField
              label="Blinded"
              checked={field.value}
              onChange={field.onChange}
              hint="Once the study opens, staff see conditions only as neutral codes (A, B, C) until the study closes or is unblinded with a recorded reason."
            />
          )}
        />
      </fieldset>

      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-sm font-semibold text-ink">Size, time and budget</legend>
        <TextField
          label="Target number of participants"
          inputMode="numeric"
          error={errors.targetSize?.message}
          {...register('targetSize')}
        />
        <TextField
          label="Estimated minutes per participant"
          inputMode="numeric"
          hint="Across all steps."
          error={errors.estimatedMinutes?.message}
          {...register('estimatedMinutes')}
        />
        <TextField
          label="Budget"
          inputMode="decimal"
          hint="In the currency beside it, e.g. 6000 or 6,000.00."
          error={errors.budget?.message}
          {...register('budget')}
        />
        <TextField
          label="Currency"
          autoComplete="off"
          maxLength={3}
          hint="Three-letter code, e.g. USD, EUR, GBP."
          error={errors.currency?.message}
          {...register('currency')}
        />
      </fieldset>

      <div className="flex justify-end gap-2 border-t border-line pt-4">
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={createStudy.isPending}>
          Create study
        </Button>
      </div>
    </form>
  );
}
