import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { SelectField } from '@/components/ui/select-field';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { applyServerErrors } from '@/lib/form-server-errors';
import {
  emptyConsentDraftInput,
  newConsentDraftInputSchema,
  useCreateConsentDraft,
  type NewConsentDraftInput,
} from '../api/create-consent-draft';
import { useConsentTemplates, type ConsentTemplate } from '../api/get-consent-templates';
import { useStudySteps } from '../api/get-study-steps';
import type { ConsentVersion } from '../api/get-consent-versions';
import { isStepsProblem, noStepsMessage } from '../utils/steps-problem';
import { fieldsForTemplate } from '../utils/template-field-labels';
import { templateValueFieldNames, withoutValuesPrefix } from '../utils/template-value-errors';
import { TemplateCaution } from './template-caution';
import { TemplateValueFields } from './template-value-fields';

/** Give it a new `key` each time it opens, so every draft starts from an empty form. */
export interface NewDraftDialogProps {
  studyId: string;
  open: boolean;
  onClose: () => void;
  onCreated: (version: ConsentVersion) => void;
}

export function NewDraftDialog({ studyId, open, onClose, onCreated }: NewDraftDialogProps) {
  const templates = useConsentTemplates();
  return (
    <ModalDialog
      open={open}
      onClose={onClose}
      size="wide"
      title="New draft from a template"
      description="Fill in what you know now. Anything left blank is taken from the study or marked “to fill” in the draft, and you can edit every word afterwards."
    >
      {templates.isPending ? (
        <LoadingState label="Loading templates…" />
      ) : templates.isError ? (
        <ErrorState
          message={templates.error instanceof ApiError ? templates.error.message : 'The templates could not be loaded.'}
          onRetry={() => void templates.refetch()}
        />
      ) : templates.data.length === 0 ? (
        <Notice>There is no consent template on this server. Ask the lab admin to install the legal templates.</Notice>
      ) : (
        <NewDraftForm studyId={studyId} templates={templates.data} onCancel={onClose} onCreated={onCreated} />
      )}
    </ModalDialog>
  );
}

interface NewDraftFormProps {
  studyId: string;
  templates: ConsentTemplate[];
  onCancel: () => void;
  onCreated: (version: ConsentVersion) => void;
}

const formFields = ['templateId', ...templateValueFieldNames] as const;

function NewDraftForm({ studyId, templates, onCancel, onCreated }: NewDraftFormProps) {
  const createDraft = useCreateConsentDraft(studyId);
  const form = useForm<NewConsentDraftInput>({
    resolver: zodResolver(newConsentDraftInputSchema),
    defaultValues: emptyConsentDraftInput(templates[0]?.id ?? ''),
  });
  const { control, handleSubmit, setError, watch, formState } = form;
  const template = templates.find((candidate) => candidate.id === watch('templateId')) ?? templates[0];
  const fields = fieldsForTemplate(template?.fields ?? []);
  const steps = useStudySteps(studyId);
  const stepCount = steps.data?.items.length ?? null;
  const [stepsProblem, setStepsProblem] = useState<string | null>(null);

  const onSubmit = (event: React.FormEvent<HTMLFormElement>) => {
    // Said at the first try, beside the step summary, whatever else the form still lacks.
    setStepsProblem(stepCount === 0 ? noStepsMessage : null);
    return handleSubmit((input) => {
      if (stepCount === 0) return;
      createDraft.mutate(input, {
        onSuccess: (version) => onCreated(version),
        onError: (error) =>
          isStepsProblem(error)
            ? setStepsProblem(noStepsMessage)
            : applyServerErrors(withoutValuesPrefix(error), formFields, setError),
      });
    })(event);
  };

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="New consent draft">
      <TemplateCaution />
      {formState.errors.root?.server?.message && <Notice>{formState.errors.root.server.message}</Notice>}
      <Controller
        control={control}
        name="templateId"
        render={({ field, fieldState }) => (
          <SelectField
            label="Template"
            value={field.value}
            onChange={field.onChange}
            onBlur={field.onBlur}
            buttonRef={field.ref}
            options={templates.map((candidate) => ({
              value: candidate.id,
              label: candidate.title,
              description: `Template version ${candidate.version}`,
            }))}
            error={fieldState.error?.message}
          />
        )}
      />
      <TemplateValueFields form={form} fields={fields} />
      <div className="flex flex-col gap-1 text-sm" aria-live="polite">
        <p id="draft-steps-summary" className="text-ink-muted">
          Steps and pay come from the study’s set-up
          {stepCount === null
            ? '.'
            : stepCount === 0
              ? ': it has no steps yet.'
              : `: ${stepCount} ${stepCount === 1 ? 'step' : 'steps'}.`}
        </p>
        {stepsProblem && <p className="font-medium text-danger">{stepsProblem}</p>}
      </div>
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={createDraft.isPending}>
          Create draft
        </Button>
      </DialogActions>
    </form>
  );
}
