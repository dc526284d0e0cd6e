import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { ModalDialog } from '@/components/ui/modal-dialog';
import { Panel } from '@/components/ui/panel';
import { tableRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { roleLabels, type StaffRole } from '@/lib/role-access';
import { useStaffStudies } from '../api/get-staff-studies';
import { AddStudyForm } from './add-study-form';
import { membershipErrorMessage } from './membership-labels';
import { RemoveMembershipDialog, type MembershipToRemove } from './remove-membership-dialog';

export interface StaffStudiesPanelProps {
  person: { id: string; email: string; name: string; role: StaffRole; active: boolean };
}

/** One staff member's studies, on their page in the staff area (admins only, as the api allows). */
export function StaffStudiesPanel({ person }: StaffStudiesPanelProps) {
  const studies = useStaffStudies(person.id);
  const [adding, setAdding] = useState(false);
  const [removing, setRemoving] = useState<MembershipToRemove | null>(null);
  const [announcement, setAnnouncement] = useState<string | null>(null);
  const name = person.name || person.email;

  const body = () => {
    if (studies.isPending) return <LoadingState label="Loading their studies…" />;
    if (studies.isError) {
      return (
        <ErrorState
          message={membershipErrorMessage(studies.error, 'Their studies could not be loaded.')}
          onRetry={() => void studies.refetch()}
        />
      );
    }
    if (studies.data.items.length === 0) {
      return (
        <EmptyState title="No studies yet">
          {name} sees no study until you add them to one
          {person.role === 'auditor' || person.role === 'admin'
            ? ', although their role already lets them read every study'
            : ''}
          .
        </EmptyState>
      );
    }
    return (
      <div className={tableRecipe.frame}>
        <table className={tableRecipe.table}>
          <caption className="sr-only">Studies {name} works on</caption>
          <thead>
            <tr>
              <th scope="col" className={tableRecipe.headCell}>
                Study
              </th>
              <th scope="col" className={tableRecipe.headCell}>
                Role in study
              </th>
              <th scope="col" className={tableRecipe.headCell}>
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {studies.data.items.map((membership) => (
              <tr key={membership.studyId} className={tableRecipe.row}>
                <td className={`${tableRecipe.cell} font-medium`}>
                  <Link
                    to={`/studies/${membership.studyId}/setup#members`}
                    className="text-spruce-ink underline-offset-2 hover:underline"
                  >
                    {membership.title}
                  </Link>
                </td>
                <td className={tableRecipe.cell}>
                  <Badge>{roleLabels[membership.role as StaffRole] ?? membership.role}</Badge>
                </td>
                <td className={`${tableRecipe.cell} text-right`}>
                  <Button
                    variant="quiet"
                    size="compact"
                    aria-label={`Remove ${name} from ${membership.title}`}
                    onClick={() => {
                      setAnnouncement(null);
                      setRemoving({
                        studyId: membership.studyId,
                        studyTitle: membership.title,
                        userId: person.id,
                        personName: name,
                      });
                    }}
                  >
                    Remove
                  </Button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    );
  };

  return (
    <Panel
      id="studies"
      title="Studies"
      description={`The studies ${name} works on. They see only these in the Studies area.`}
      actions={
        <Button
          variant="primary"
          disabled={!person.active}
          title={person.active ? undefined : 'Reactivate the account first.'}
          onClick={() => {
            setAnnouncement(null);
            setAdding(true);
          }}
        >
          Add to a study
        </Button>
      }
    >
      <div aria-live="polite" className="mb-3 empty:hidden">
        {announcement && <Notice tone="info">{announcement}</Notice>}
      </div>
      {body()}
      <ModalDialog open={adding} onClose={() => setAdding(false)} title={`Give ${name} a study`}>
        {adding && (
          <AddStudyForm
            person={person}
            memberOf={studies.data?.items ?? []}
            onCancel={() => setAdding(false)}
            onAdded={(title) => {
              setAdding(false);
              setAnnouncement(`${name} was added to ${title}.`);
            }}
          />
        )}
      </ModalDialog>
      <RemoveMembershipDialog
        membership={removing}
        onClose={() => setRemoving(null)}
        onRemoved={(removed) => {
          setRemoving(null);
          setAnnouncement(`${name} was removed from ${removed.studyTitle}.`);
        }}
      />
    </Panel>
  );
}
