import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { applyServerErrors } from '@/lib/form-server-errors';
import { consentValuesInput, consentValuesInputSchema, type ConsentValuesInput } from '../api/create-consent-draft';
import { useConsentTemplates, type ConsentTemplate } from '../api/get-consent-templates';
import type { ConsentVersion } from '../api/get-consent-versions';
import { useRefillConsentDraft } from '../api/refill-consent-draft';
import { fieldsForTemplate } from '../utils/template-field-labels';
import { templateValueFieldNames, withoutValuesPrefix } from '../utils/template-value-errors';
import { TemplateCaution } from './template-caution';
import { TemplateValueFields } from './template-value-fields';
import { isStepsProblem, noStepsMessage } from '../utils/steps-problem';

/** Give it a new `key` each time it opens, so the form starts again from the draft's stored values. */
export interface RefillDraftDialogProps {
  studyId: string;
  version: ConsentVersion;
  open: boolean;
  /** The text box holds edits that are not saved; they are replaced too. */
  unsavedEdits: boolean;
  onClose: () => void;
  onRefilled: (version: ConsentVersion) => void;
}

export function RefillDraftDialog({
  studyId,
  version,
  open,
  unsavedEdits,
  onClose,
  onRefilled,
}: RefillDraftDialogProps) {
  return (
    <ModalDialog
      open={open}
      onClose={onClose}
      size="wide"
      title={`Fill in version ${version.version} again from the study`}
      description="The template is filled in again with the study’s title, time, number of participants, contact address, steps and pay as they are now, and with the values below."
    >
      <RefillDraftContent
        studyId={studyId}
        version={version}
        unsavedEdits={unsavedEdits}
        onCancel={onClose}
        onRefilled={onRefilled}
      />
    </ModalDialog>
  );
}

interface RefillDraftContentProps {
  studyId: string;
  version: ConsentVersion;
  unsavedEdits: boolean;
  onCancel: () => void;
  onRefilled: (version: ConsentVersion) => void;
}

// Inside the panel, so the templates are asked for only once the dialog opens.
function RefillDraftContent({ studyId, version, unsavedEdits, onCancel, onRefilled }: RefillDraftContentProps) {
  const templates = useConsentTemplates();
  const template = templates.data?.find((candidate) => candidate.id === version.templateId);
  if (templates.isPending) return <LoadingState label="Loading the template…" />;
  if (templates.isError) {
    return (
      <ErrorState
        message={templates.error instanceof ApiError ? templates.error.message : 'The templates could not be loaded.'}
        onRetry={() => void templates.refetch()}
      />
    );
  }
  if (!template) {
    return (
      <Notice>
        The template this draft was made from ({version.templateId}) is no longer on this server, so the draft cannot be
        filled in again. Edit the text by hand, or start a new draft from a current template.
      </Notice>
    );
  }
  return (
    <RefillDraftForm
      studyId={studyId}
      version={version}
      template={template}
      unsavedEdits={unsavedEdits}
      onCancel={onCancel}
      onRefilled={onRefilled}
    />
  );
}

interface RefillDraftFormProps {
  studyId: string;
  version: ConsentVersion;
  template: ConsentTemplate;
  unsavedEdits: boolean;
  onCancel: () => void;
  onRefilled: (version: ConsentVersion) => void;
}

function RefillDraftForm({ studyId, version, template, unsavedEdits, onCancel, onRefilled }: RefillDraftFormProps) {
  const refill = useRefillConsentDraft(studyId, version.id);
  const form = useForm<ConsentValuesInput>({
    resolver: zodResolver(consentValuesInputSchema),
    defaultValues: consentValuesInput(version.templateValues),
  });
  const { handleSubmit, setError, formState } = form;

  const onSubmit = handleSubmit((input) =>
    refill.mutate(input, {
      onSuccess: (refilled) => onRefilled(refilled),
      onError: (error) =>
        isStepsProblem(error)
          ? setError('root.server', { type: 'server', message: noStepsMessage })
          : applyServerErrors(withoutValuesPrefix(error), templateValueFieldNames, setError),
    }),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Fill in the draft again">
      <Notice tone="caution">
        <p className="font-semibold">This replaces the whole form text with the template’s wording.</p>
        <p className="mt-0.5">
          Any changes you made to the wording by hand
          {unsavedEdits ? ', including the edits in the text box that are not saved yet,' : ''} will be lost. Copy
          anything you want to keep before you go on.
        </p>
      </Notice>
      <TemplateCaution />
      {formState.errors.root?.server?.message && <Notice>{formState.errors.root.server.message}</Notice>}
      <TemplateValueFields form={form} fields={fieldsForTemplate(template.fields)} />
      <DialogActions>
        <Button onClick={onCancel}>Cancel</Button>
        <Button type="submit" variant="primary" pending={refill.isPending}>
          Replace the text
        </Button>
      </DialogActions>
    </form>
  );
}
