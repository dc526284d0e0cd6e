import { Description, Field, Label, Textarea } from '@headlessui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import { useRef, useState } from 'react';
import { useForm } from 'react-hook-form';
import { Badge } from '@/components/ui/badge';
import { Panel } from '@/components/ui/panel';
import { Button } from '@/components/ui/button';
import { fieldRecipe } from '@/components/ui/recipes';
import { Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { applyServerErrors } from '@/lib/form-server-errors';
import { useCheckConsentVersion } from '../api/check-consent-version';
import type { ConsentVersion } from '../api/get-consent-versions';
import { consentBodyInputSchema, useUpdateConsentDraft, type ConsentBodyInput } from '../api/update-consent-draft';
import { scrollTextareaToOffset } from '../utils/scroll-textarea';
import { lineRange } from '../utils/text-lines';
import { ActivationDialog } from './activation-dialog';
import { ApprovalDetailsForm } from './approval-details-form';
import { ApprovalLetterUpload } from './approval-letter-upload';
import { ConsentPreview } from './consent-preview';
import { DraftFindings } from './draft-findings';
import { RefillDraftDialog } from './refill-draft-dialog';
import { TemplateCaution } from './template-caution';

const bodyTextareaClass =
  'block h-[34rem] w-full resize-y rounded-md border border-line-strong bg-surface px-3 py-2 font-mono text-xs leading-5 text-ink focus:outline-none data-focus:border-spruce data-focus:outline-2 data-focus:-outline-offset-1 data-focus:outline-spruce data-invalid:border-danger';

export interface DraftEditorProps {
  studyId: string;
  version: ConsentVersion;
  activeVersionNumber: number | null;
  onActivated: (version: ConsentVersion) => void;
}

export function DraftEditor({ studyId, version, activeVersionNumber, onActivated }: DraftEditorProps) {
  const update = useUpdateConsentDraft(studyId, version.id);
  const check = useCheckConsentVersion(studyId, version.id);
  const textarea = useRef<HTMLTextAreaElement | null>(null);
  const [checkedBody, setCheckedBody] = useState<string | null>(null);
  const [bodyStatus, setBodyStatus] = useState('');
  const [activating, setActivating] = useState(false);
  const [refilling, setRefilling] = useState(false);
  const [refillFormKey, setRefillFormKey] = useState(0);

  const {
    register,
    handleSubmit,
    setError,
    reset,
    watch,
    formState: { errors, isDirty },
  } = useForm<ConsentBodyInput>({
    resolver: zodResolver(consentBodyInputSchema),
    defaultValues: { body: version.body },
  });
  const { ref: registerBodyRef, ...bodyField } = register('body');
  const body = watch('body');

  const save = (then?: (saved: ConsentVersion) => void) =>
    handleSubmit(({ body: text }) => {
      setBodyStatus('');
      update.mutate(
        { body: text },
        {
          onSuccess: (saved) => {
            reset({ body: saved.body });
            setBodyStatus('Saved. The preview shows the saved text.');
            then?.(saved);
          },
          onError: (error) => applyServerErrors(error, ['body'], setError),
        },
      );
    });

  const startRefill = () => {
    setRefillFormKey((key) => key + 1);
    setRefilling(true);
  };

  const runCheck = () => check.mutate(undefined, { onSuccess: () => setCheckedBody(textarea.current?.value ?? body) });
  const saveAndCheck = () => (isDirty ? save(() => runCheck())() : runCheck());

  const jumpToLine = (line: number) => {
    const element = textarea.current;
    if (!element) return;
    const { start, end } = lineRange(element.value, line);
    element.focus();
    element.setSelectionRange(start, end);
    scrollTextareaToOffset(element, start);
  };

  const ready = {
    reference: Boolean(version.approvalReference),
    date: Boolean(version.approvedAt),
    letter: version.approvalLetter !== null,
  };
  const readyToActivate = ready.reference && ready.date && ready.letter && !isDirty;

  return (
    <div className="flex flex-col gap-5">
      <TemplateCaution />

      <Panel
        id="form-text"
        title="Form text"
        description="Edit the Markdown on the left; the preview on the right shows the text as last saved."
        actions={
          <>
            {isDirty && (
              <span className="self-center">
                <Badge tone="caution">Unsaved changes</Badge>
              </span>
            )}
            <Button onClick={startRefill}>Fill in again from the study…</Button>
          </>
        }
      >
        <form onSubmit={save()} noValidate className="grid gap-4 lg:grid-cols-2" aria-label="Form text">
          <Field className={fieldRecipe.field}>
            <Label className={fieldRecipe.label}>Form text (Markdown)</Label>
            <Description className={fieldRecipe.hint}>
              Headings start with #. The comment lines such as “element: b2” tell the check which required element a
              section covers.
            </Description>
            <Textarea
              {...bodyField}
              ref={(element: HTMLTextAreaElement | null) => {
                registerBodyRef(element);
                textarea.current = element;
              }}
              spellCheck
              invalid={Boolean(errors.body)}
              className={bodyTextareaClass}
            />
            {errors.body?.message && (
              <p className={fieldRecipe.error} role="alert">
                {errors.body.message}
              </p>
            )}
            <div className="mt-1 flex items-center gap-3">
              <Button type="submit" variant="primary" pending={update.isPending} disabled={!isDirty}>
                Save text
              </Button>
              <p aria-live="polite" className="text-xs text-ink-muted">
                {isDirty ? 'Save to update the preview.' : bodyStatus}
              </p>
            </div>
            {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
          </Field>
          <div className="flex flex-col gap-1">
            <p className={fieldRecipe.label}>Preview of the saved text</p>
            <p className={fieldRecipe.hint}>What participants will read, about {version.readingMinutes} minutes.</p>
            <ConsentPreview
              html={version.previewHtml}
              label="Preview of the saved form"
              className="h-[34rem] bg-canvas"
            />
          </div>
        </form>
      </Panel>

      <Panel
        id="required-elements"
        title="Required elements"
        description="Checks the saved text for the key information and each basic element of informed consent in 45 CFR 46.116."
        actions={
          <Button onClick={saveAndCheck} pending={check.isPending || (update.isPending && isDirty)}>
            {isDirty ? 'Save and run the check' : 'Run the check'}
          </Button>
        }
      >
        <div aria-live="polite">
          {check.isError ? (
            <Notice>
              {check.error instanceof ApiError ? check.error.message : 'The check could not be run. Try again.'}
            </Notice>
          ) : check.data ? (
            <DraftFindings
              check={check.data}
              stale={checkedBody !== null && checkedBody !== body}
              onJumpToLine={jumpToLine}
            />
          ) : (
            <p className="text-sm text-ink-faint">Not run yet for this draft.</p>
          )}
        </div>
      </Panel>

      <Panel
        id="ethics-approval"
        title="Ethics approval"
        description="Enter the details from the board’s approval letter and upload the letter itself."
      >
        <div className="flex flex-col gap-4">
          <ApprovalDetailsForm studyId={studyId} version={version} />
          <ApprovalLetterUpload studyId={studyId} version={version} />
        </div>
      </Panel>

      <Panel
        id="activation"
        title="Activation"
        description={`Activation fixes the text and its fingerprint${activeVersionNumber !== null ? `, retires version ${activeVersionNumber} and asks everyone enrolled to sign again` : ' and lets participants sign'}.`}
      >
        <ul aria-label="Ready to activate" className="flex flex-col gap-1 text-sm">
          <ReadinessItem done={ready.reference}>Approval reference entered</ReadinessItem>
          <ReadinessItem done={ready.date}>Approval date entered</ReadinessItem>
          <ReadinessItem done={ready.letter}>Approval letter uploaded</ReadinessItem>
          <ReadinessItem done={!isDirty}>Text saved</ReadinessItem>
          <ReadinessItem
            done={check.data?.passes === true && checkedBody === body}
            pendingLabel="not confirmed yet; activation runs it again"
          >
            Required-elements check passed
          </ReadinessItem>
        </ul>
        <div className="mt-3">
          <Button variant="primary" disabled={!readyToActivate} onClick={() => setActivating(true)}>
            Activate version {version.version}…
          </Button>
        </div>
      </Panel>

      <RefillDraftDialog
        key={refillFormKey}
        studyId={studyId}
        version={version}
        open={refilling}
        unsavedEdits={isDirty}
        onClose={() => setRefilling(false)}
        onRefilled={(refilled) => {
          setRefilling(false);
          reset({ body: refilled.body });
          setBodyStatus('Filled in again from the study and the template. The preview shows the new text.');
        }}
      />

      <ActivationDialog
        studyId={studyId}
        version={version}
        activeVersionNumber={activeVersionNumber}
        open={activating}
        onClose={() => setActivating(false)}
        onActivated={(activated) => {
          setActivating(false);
          onActivated(activated);
        }}
      />
    </div>
  );
}

function ReadinessItem({
  done,
  pendingLabel = 'not yet',
  children,
}: {
  done: boolean;
  pendingLabel?: string;
  children: React.ReactNode;
}) {
  return (
    <li className="flex items-center gap-2">
      <span aria-hidden="true" className={done ? 'text-success' : 'text-ink-faint'}>
        {done ? '✓' : '○'}
      </span>
      <span className={done ? 'text-ink' : 'text-ink-muted'}>
        {children}
        {done ? (
          <span className="sr-only">: done</span>
        ) : (
          <span className="text-xs text-ink-faint"> ({pendingLabel})</span>
        )}
      </span>
    </li>
  );
}
