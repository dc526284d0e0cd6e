import { Description, Dialog, DialogBackdrop, DialogPanel, DialogTitle, Fieldset, Legend } from '@headlessui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm, type UseFormReturn } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { cx } from '@/components/ui/cx';
import { DialogActions } from '@/components/ui/modal-dialog';
import { CheckboxField } from '@/components/ui/checkbox-field';
import { dialogRecipe } from '@/components/ui/recipes';
import { SelectField } from '@/components/ui/select-field';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { TextField } from '@/components/ui/text-field';
import { ApiError } from '@/lib/api-error';
import { applyServerErrors } from '@/lib/form-server-errors';
import {
  emptyConsentDraftInput,
  newConsentDraftInputSchema,
  useCreateConsentDraft,
  type ConsentValueField,
  type NewConsentDraftInput,
} from '../api/create-consent-draft';
import { useConsentTemplates, type ConsentTemplate } from '../api/get-consent-templates';
import type { ConsentVersion } from '../api/get-consent-versions';
import { fieldsForTemplate, templateFieldGroups, templateFieldLabels } from '../utils/template-field-labels';
import { TemplateCaution } from './template-caution';

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
    <Dialog open={open} onClose={onClose} transition className="relative z-50">
      <DialogBackdrop transition className={dialogRecipe.backdrop} />
      <div className={cx(dialogRecipe.frame, 'pt-[6vh]!')}>
        <DialogPanel transition className={cx(dialogRecipe.panel, 'max-w-2xl!')}>
          <div className="border-b border-line px-5 pt-4 pb-3">
            <DialogTitle className={dialogRecipe.title}>New draft from a template</DialogTitle>
            <Description className={dialogRecipe.description}>
              Fill in what you know now. Anything left blank is taken from the study or marked “to fill” in the draft, and you can edit
              every word afterwards.
            </Description>
          </div>
          <div className="px-5 py-4">
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
          </div>
        </DialogPanel>
      </div>
    </Dialog>
  );
}

interface NewDraftFormProps {
  studyId: string;
  templates: ConsentTemplate[];
  onCancel: () => void;
  onCreated: (version: ConsentVersion) => void;
}

const formFields = ['templateId', ...(Object.keys(templateFieldLabels) as ConsentValueField[])] as const;

/** The api names template values `values.<field>`; the form names them `<field>`. */
function withoutValuesPrefix(error: unknown): unknown {
  if (!(error instanceof ApiError)) return error;
  return new ApiError({
    statusCode: error.status,
    code: error.code,
    message: error.message,
    errors: error.fieldErrors.map((problem) => ({ ...problem, field: problem.field.replace(/^values\./, '') })),
  });
}

function NewDraftForm({ studyId, templates, onCancel, onCreated }: NewDraftFormProps) {
  const createDraft = useCreateConsentDraft(studyId);
  const form = useForm<NewConsentDraftInput>({
    resolver: zodResolver(newConsentDraftInputSchema),
    defaultValues: emptyConsentDraftInput(templates[0]?.id ?? ''),
  });
  const { control, handleSubmit, setError, watch, formState } = form;
  const template = templates.find((candidate) => candidate.id === watch('templateId')) ?? templates[0];
  const fields = fieldsForTemplate(template?.fields ?? []);

  const onSubmit = handleSubmit((input) =>
    createDraft.mutate(input, {
      onSuccess: (version) => onCreated(version),
      onError: (error) => applyServerErrors(withoutValuesPrefix(error), formFields, setError),
    }),
  );

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
            options={templates.map((candidate) => ({ value: candidate.id, label: candidate.title, description: `Template version ${candidate.version}` }))}
            error={fieldState.error?.message}
          />
        )}
      />
      {templateFieldGroups.map((group) => {
        const inGroup = fields.filter((field) => templateFieldLabels[field].group === group.id);
        if (inGroup.length === 0) return null;
        return (
          <Fieldset key={group.id} className="flex flex-col gap-3">
            <Legend className="text-sm font-semibold text-ink">{group.legend}</Legend>
            <div className="grid gap-3 sm:grid-cols-2">
              {inGroup.map((field) => (
                <TemplateValueField key={field} field={field} form={form} />
              ))}
            </div>
          </Fieldset>
        );
      })}
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={createDraft.isPending}>
          Create draft
        </Button>
      </DialogActions>
    </form>
  );
}

function TemplateValueField({ field, form }: { field: ConsentValueField; form: UseFormReturn<NewConsentDraftInput> }) {
  const { label, hint, kind } = templateFieldLabels[field];
  const error = form.formState.errors[field]?.message;

  if (kind === 'yes-no') {
    return (
      <Controller
        control={form.control}
        name="futureUseDeidentified"
        render={({ field: checkbox }) => (
          <CheckboxField className="sm:col-span-2" label={label} hint={hint} checked={checkbox.value} onChange={checkbox.onChange} />
        )}
      />
    );
  }
  if (kind === 'long-text') {
    return <TextAreaField className="sm:col-span-2" label={label} hint={hint} error={error} rows={3} {...form.register(field)} />;
  }
  return (
    <TextField
      label={label}
      hint={hint}
      error={error}
      type={kind === 'number' ? 'text' : kind}
      inputMode={kind === 'number' ? 'numeric' : undefined}
      autoComplete="off"
      {...form.register(field)}
    />
  );
}
