import { Link } from 'react-router-dom';
import { tableRecipe } from '@/components/ui/recipes';
import type { ConsentVersion } from '../api/get-consent-versions';
import { formatLetterDate } from '../utils/consent-dates';
import { shortFingerprint } from '../utils/fingerprint';
import { ConsentStatusBadge } from './consent-status-badge';

export function ConsentVersionsTable({
  versions,
  versionHref,
}: {
  versions: readonly ConsentVersion[];
  versionHref: (id: string) => string;
}) {
  return (
    <div className={tableRecipe.frame}>
      <table className={tableRecipe.table}>
        <caption className="sr-only">Consent versions, newest first</caption>
        <thead>
          <tr>
            <th scope="col" className={tableRecipe.headCell}>
              Version
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Status
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Ethics approval
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Fingerprint
            </th>
            <th scope="col" className={`${tableRecipe.headCell} text-right`}>
              Signatures
            </th>
          </tr>
        </thead>
        <tbody>
          {versions.map((version) => (
            <tr key={version.id} className={tableRecipe.row}>
              <td className={`${tableRecipe.cell} font-medium`}>
                <Link to={versionHref(version.id)} className="text-spruce-ink underline-offset-2 hover:underline">
                  Version {version.version}
                </Link>
              </td>
              <td className={tableRecipe.cell}>
                <ConsentStatusBadge status={version.status} />
              </td>
              <td className={`${tableRecipe.cell} text-ink-muted`}>
                {version.approvalReference ? (
                  <>
                    <span className="font-mono text-xs text-ink">{version.approvalReference}</span>
                    {version.approvedAt && (
                      <span className="ml-1.5 whitespace-nowrap">of {formatLetterDate(version.approvedAt)}</span>
                    )}
                  </>
                ) : (
                  'Not yet entered'
                )}
              </td>
              <td className={`${tableRecipe.cell} font-mono text-xs`}>
                {version.fingerprint ? (
                  <span title={version.fingerprint}>
                    <span aria-hidden="true">{shortFingerprint(version.fingerprint)}</span>
                    <span className="sr-only">{version.fingerprint}</span>
                  </span>
                ) : (
                  <span className="font-sans text-sm text-ink-faint">Fixed at activation</span>
                )}
              </td>
              <td className={`${tableRecipe.cell} text-right tabular-nums`}>{version.signatures}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
