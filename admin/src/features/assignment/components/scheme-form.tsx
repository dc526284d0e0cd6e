import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { Controller, FormProvider, useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { RadioCards } from '@/components/ui/radio-cards';
import { Notice } from '@/components/ui/states';
import { applyApiFieldErrors } from '@/lib/form-field-errors';
import { schemeFieldOf, schemeFormSchema, useSaveAssignmentScheme } from '../api/save-assignment-scheme';
import {
  methodsFor,
  schemeFormValuesFrom,
  toSchemeSettings,
  type SchemeContext,
  type SchemeFormValues,
  type SchemeMethod,
} from '../utils/scheme-settings';
import { SchemeParameterFields } from './scheme-parameter-fields';
import { schemeMethodText } from './scheme-methods';

export interface SchemeFormProps {
  studyId: string;
  context: SchemeContext;
  /** What is saved now (GET …/assignment `method` and `settings`). */
  savedMethod: string | null;
  savedSettings: Record<string, unknown>;
  /** The study is open with nobody assigned: saving seals a fresh sequence. */
  resealsOnSave: boolean;
  /** Where the dry run is, to try the scheme out. */
  dryRunPath?: string;
}

export function SchemeForm({
  studyId,
  context,
  savedMethod,
  savedSettings,
  resealsOnSave,
  dryRunPath,
}: SchemeFormProps) {
  const save = useSaveAssignmentScheme(studyId);
  const [saved, setSaved] = useState<string | null>(null);
  const form = useForm<SchemeFormValues>({
    resolver: zodResolver(schemeFormSchema(context)),
    defaultValues: schemeFormValuesFrom(savedMethod, savedSettings, context),
  });
  const {
    control,
    handleSubmit,
    setError,
    formState: { errors, isDirty },
  } = form;

  const onSubmit = handleSubmit((values) => {
    setSaved(null);
    const method = values.method as SchemeMethod;
    save.mutate(
      { method, settings: toSchemeSettings(values) },
      {
        onSuccess: (assignment) => {
          form.reset(schemeFormValuesFrom(assignment.method, assignment.settings, context));
          setSaved(
            `Saved: ${schemeMethodText[method].label}.${resealsOnSave ? ' A fresh sequence was sealed under a new fingerprint.' : ''}`,
          );
        },
        onError: (error) => applyApiFieldErrors(error, setError, schemeFieldOf),
      },
    );
  });

  const options = methodsFor(context.design).map((method) => ({
    value: method,
    label: schemeMethodText[method].label,
    description: schemeMethodText[method].explanation,
  }));

  return (
    <FormProvider {...form}>
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Assignment scheme">
        {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
        {resealsOnSave && (
          <Notice tone="caution">
            The study is open and nobody is assigned yet: saving a scheme seals a fresh sequence under a new
            fingerprint.
          </Notice>
        )}
        <Controller
          control={control}
          name="method"
          render={({ field, fieldState }) => (
            <RadioCards
              label="Assignment method"
              value={field.value}
              onChange={field.onChange}
              options={options}
              error={fieldState.error?.message}
              columns={2}
            />
          )}
        />
        <SchemeParameterFields context={context} />
        <div aria-live="polite" className="empty:hidden">
          {saved && !isDirty && <Notice tone="info">{saved}</Notice>}
        </div>
        <div className="flex flex-wrap items-center justify-between gap-3 border-t border-line pt-3">
          <p className="text-sm text-ink-muted">
            {savedMethod ? (
              <>
                Saved now:{' '}
                <span className="font-medium text-ink">
                  {schemeMethodText[savedMethod as SchemeMethod]?.label ?? savedMethod}
                </span>
                {isDirty && ' (unsaved changes)'}
              </>
            ) : (
              'No scheme saved yet. A study cannot open without one.'
            )}
          </p>
          <div className="flex items-center gap-3">
            {dryRunPath && savedMethod && (
              <Link to={dryRunPath} className="text-sm font-medium text-spruce-ink underline-offset-2 hover:underline">
                Try it in a dry run
              </Link>
            )}
            <Button type="submit" variant="primary" pending={save.isPending}>
              Save scheme
            </Button>
          </div>
        </div>
      </form>
    </FormProvider>
  );
}
