import { useRef, useState } from 'react';
import { Button } from '@/components/ui/button';
import { CopyButton } from '@/components/ui/copy-button';
import { DialogActions, ModalDialog } from '@/components/ui/modal-dialog';
import { Panel } from '@/components/ui/panel';
import { textareaRecipe } from '@/components/ui/recipes';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useReturnLink, type ReturnLinkSetup } from '../api/get-return-link';
import { useRotateReturnKey } from '../api/rotate-return-key';
import { formatMoment } from '@/lib/dates';

export interface ReturnLinkPanelProps {
  studyId: string;
  /** Designers may rotate the signing key while the study is not closed. */
  canRotate: boolean;
}

/** What a lab pastes into its external task so participants come back to Evenhand and the step is marked done. */
export function ReturnLinkPanel({ studyId, canRotate }: ReturnLinkPanelProps) {
  const returnLink = useReturnLink(studyId);
  return (
    <Panel
      id="return-link"
      title="Return address for your external task"
      description="For steps checked by a return link: where your survey or experiment tool sends participants when they finish, so Evenhand marks the step done."
    >
      {returnLink.isPending ? (
        <LoadingState label="Loading the return address…" />
      ) : returnLink.isError ? (
        <ErrorState
          message={
            returnLink.error instanceof ApiError ? returnLink.error.message : 'The return address could not be loaded.'
          }
          onRetry={() => void returnLink.refetch()}
        />
      ) : (
        <ReturnLinkDetails studyId={studyId} setup={returnLink.data} canRotate={canRotate} />
      )}
    </Panel>
  );
}

function ReturnLinkDetails({
  studyId,
  setup,
  canRotate,
}: {
  studyId: string;
  setup: ReturnLinkSetup;
  canRotate: boolean;
}) {
  const templateRef = useRef<HTMLTextAreaElement>(null);
  const rotate = useRotateReturnKey(studyId);
  const [confirming, setConfirming] = useState(false);
  const [announcement, setAnnouncement] = useState<string | null>(null);

  const confirmRotation = () =>
    rotate.mutate(undefined, {
      onSuccess: (next) => {
        setConfirming(false);
        setAnnouncement(
          `The signing key was rotated. New return links use key ${next.keyId}; links signed before keep working for ${next.graceDays} days.`,
        );
      },
    });

  return (
    <div className="flex flex-col gap-4 text-sm">
      <div className="flex flex-col gap-1">
        <label htmlFor="return-address-template" className="text-xs font-semibold text-ink">
          Return address template
        </label>
        <div className="flex flex-wrap items-center gap-2">
          <textarea
            id="return-address-template"
            ref={templateRef}
            readOnly
            rows={1}
            value={setup.returnAddressTemplate}
            onFocus={(event) => event.currentTarget.select()}
            className={`${textareaRecipe} min-h-0! min-w-0 flex-1 basis-72 resize-none font-mono text-xs break-all [field-sizing:content] focus:border-spruce focus:outline-2 focus:-outline-offset-1 focus:outline-spruce`}
          />
          <CopyButton
            value={setup.returnAddressTemplate}
            label="Copy"
            aria-label="Copy the return address template"
            fallbackTarget={templateRef}
          />
        </div>
        <p className="text-xs text-ink-muted">
          <code className="font-mono">{'{token}'}</code> stands for the token Evenhand hands your task; each
          participant’s is different.
        </p>
      </div>

      <div>
        <h3 className="font-semibold text-ink">What Evenhand adds to your task address</h3>
        <p className="text-ink-muted">
          When a participant starts the step, Evenhand opens your task’s address with these parameters added:
        </p>
        <dl
          className="mt-2 grid gap-x-4 gap-y-1.5 sm:grid-cols-[max-content_1fr]"
          aria-label="Parameters added to the task address"
        >
          {setup.parameters.map((parameter) => (
            <div key={parameter.name} className="contents">
              <dt>
                <code className="rounded-sm bg-sunken px-1 font-mono text-xs text-ink">{parameter.name}</code>
              </dt>
              <dd className="text-ink">{parameter.meaning}</dd>
            </div>
          ))}
        </dl>
      </div>

      <div>
        <h3 className="font-semibold text-ink">What to paste where</h3>
        <ol className="mt-1 flex list-decimal flex-col gap-1 pl-5 text-ink">
          <li>
            Here in Evenhand, choose “Return link from an external task” for the step and enter your task’s address.
          </li>
          <li>
            In your tool, have it keep the <code className="font-mono text-xs">ref</code> and{' '}
            <code className="font-mono text-xs">token</code> it receives in the address (often called URL variables,
            embedded data or query parameters). Store answers under <code className="font-mono text-xs">ref</code>,
            never under a name or e-mail.
          </li>
          <li>
            On the tool’s last page or end-of-task redirect, paste the return address template and put the received
            token where it says <code className="font-mono text-xs">{'{token}'}</code>. If the tool can redirect to a
            value it received, use <code className="font-mono text-xs">return</code> as it is instead.
          </li>
          <li>
            Evenhand checks the signature, marks the step done and shows the participant their steps. A link works until{' '}
            {setup.validDays} days after the step is due.
          </li>
        </ol>
      </div>

      <div className="flex flex-wrap items-center justify-between gap-3 rounded-md border border-line bg-canvas px-3 py-2">
        <p className="text-ink-muted">
          Links are signed with key <span className="font-medium text-ink tabular-nums">{setup.keyId}</span>
          {setup.rotatedAt ? (
            <>
              , rotated <time dateTime={setup.rotatedAt}>{formatMoment(setup.rotatedAt)}</time>.
            </>
          ) : (
            ', never rotated.'
          )}
        </p>
        {canRotate && (
          <Button
            onClick={() => {
              rotate.reset();
              setConfirming(true);
            }}
          >
            Rotate the signing key…
          </Button>
        )}
      </div>
      <div aria-live="polite" className="empty:hidden">
        {announcement && <Notice tone="info">{announcement}</Notice>}
      </div>

      <ModalDialog
        open={confirming}
        onClose={() => setConfirming(false)}
        role="alertdialog"
        title="Rotate the signing key?"
      >
        <div className="flex flex-col gap-2 text-sm text-ink">
          <p>New return links are signed with a fresh key. Do this if a return link or the key may have leaked.</p>
          <p>
            Links already handed out keep working for <strong>{setup.graceDays} days</strong>; after that they are
            refused and those participants start the step again from Evenhand to get a new link.
          </p>
          <p>The return address template does not change, so nothing needs to change in your external tool.</p>
        </div>
        {rotate.isError && (
          <Notice className="mt-3">
            {rotate.error instanceof ApiError ? rotate.error.message : 'The key could not be rotated. Try again.'}
          </Notice>
        )}
        <DialogActions>
          <Button onClick={() => setConfirming(false)}>Cancel</Button>
          <Button variant="primary" pending={rotate.isPending} onClick={confirmRotation}>
            Rotate the key
          </Button>
        </DialogActions>
      </ModalDialog>
    </div>
  );
}
