import { Disclosure, DisclosureButton, DisclosurePanel } from '@headlessui/react';
import { formatDate } from '@/lib/date-format';
import { groupedFingerprint, shortFingerprint } from '../utils/fingerprint';

type VersionFingerprintProps = {
  version: number;
  fingerprint: string;
  approval: { reference: string; approvedAt: string };
};

/** Which form this is: its version, the ethics board's approval reference and date (not the protocol number), and the fingerprint that the signed copy will carry too. */
export function VersionFingerprint({ version, fingerprint, approval }: VersionFingerprintProps) {
  return (
    <div className="flex flex-col gap-2 rounded-soft border border-sand-deep bg-paper-raised px-4 py-3 text-fine">
      <dl className="flex flex-col gap-1">
        <div className="flex flex-wrap justify-between gap-x-3">
          <dt className="text-ink-soft">Form version</dt>
          <dd className="font-semibold">Version {version}</dd>
        </div>
        <div className="flex flex-wrap justify-between gap-x-3">
          <dt className="text-ink-soft">Ethics approval reference</dt>
          <dd className="font-semibold">
            {approval.reference}, {formatDate(approval.approvedAt)}
          </dd>
        </div>
        <div className="flex flex-wrap justify-between gap-x-3">
          <dt className="text-ink-soft">Fingerprint</dt>
          <dd className="font-mono font-semibold" title={fingerprint}>
            <span className="sr-only">
              Starts with {fingerprint.slice(0, 8)}, ends with {fingerprint.slice(-8)}:{' '}
            </span>
            <span aria-hidden="true">{shortFingerprint(fingerprint)}</span>
          </dd>
        </div>
      </dl>
      <Disclosure>
        <DisclosureButton className="self-start rounded-soft font-semibold text-clay-ink underline underline-offset-4">
          Show the whole fingerprint
        </DisclosureButton>
        <DisclosurePanel className="flex flex-col gap-2">
          <p>
            This code is worked out from the exact words of the form. The copy you receive shows the same code, so
            anyone can check later that it is the form you read.
          </p>
          <p className="font-mono leading-relaxed" aria-label={`Whole fingerprint: ${fingerprint}`}>
            {groupedFingerprint(fingerprint).join(' ')}
          </p>
        </DisclosurePanel>
      </Disclosure>
    </div>
  );
}
