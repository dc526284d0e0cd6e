import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { ModalDialog } from '@/components/ui/modal-dialog';
import { Panel } from '@/components/ui/panel';
import { tableRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { roleLabels } from '@/lib/role-access';
import { useStudyMembers } from '../api/get-study-members';
import { AddMemberForm } from './add-member-form';
import { membershipErrorMessage } from './membership-labels';
import { RemoveMembershipDialog, type MembershipToRemove } from './remove-membership-dialog';

export interface StudyMembersPanelProps {
  studyId: string;
  studyTitle: string;
  /** Admins add and remove members; everyone else who may open the study reads the list. */
  canManage: boolean;
}

export function StudyMembersPanel({ studyId, studyTitle, canManage }: StudyMembersPanelProps) {
  const members = useStudyMembers(studyId);
  const [adding, setAdding] = useState(false);
  const [removing, setRemoving] = useState<MembershipToRemove | null>(null);
  const [announcement, setAnnouncement] = useState<string | null>(null);

  const body = () => {
    if (members.isPending) return <LoadingState label="Loading members…" />;
    if (members.isError) {
      return (
        <ErrorState
          message={membershipErrorMessage(members.error, 'The members could not be loaded.')}
          onRetry={() => void members.refetch()}
        />
      );
    }
    if (members.data.items.length === 0) {
      return (
        <EmptyState title="No members yet">
          {canManage
            ? 'Add the coordinators, researchers and auditors who work on this study.'
            : 'An admin adds the people who work on this study.'}
        </EmptyState>
      );
    }
    return (
      <div className={tableRecipe.frame}>
        <table className={tableRecipe.table}>
          <caption className="sr-only">Members of {studyTitle}</caption>
          <thead>
            <tr>
              <th scope="col" className={tableRecipe.headCell}>
                Name
              </th>
              <th scope="col" className={tableRecipe.headCell}>
                E-mail
              </th>
              <th scope="col" className={tableRecipe.headCell}>
                Role in study
              </th>
              {canManage && (
                <th scope="col" className={tableRecipe.headCell}>
                  <span className="sr-only">Actions</span>
                </th>
              )}
            </tr>
          </thead>
          <tbody>
            {members.data.items.map((member) => {
              const name = member.name || member.email;
              return (
                <tr key={member.userId} className={tableRecipe.row}>
                  <td className={`${tableRecipe.cell} font-medium`}>
                    {canManage ? (
                      <Link
                        to={`/staff/${member.userId}`}
                        className="text-spruce-ink underline-offset-2 hover:underline"
                      >
                        {name}
                      </Link>
                    ) : (
                      name
                    )}
                  </td>
                  <td className={`${tableRecipe.cell} break-all text-ink-muted`}>{member.email}</td>
                  <td className={tableRecipe.cell}>
                    <Badge>{roleLabels[member.role]}</Badge>
                  </td>
                  {canManage && (
                    <td className={`${tableRecipe.cell} text-right`}>
                      <Button
                        variant="quiet"
                        size="compact"
                        aria-label={`Remove ${name} from the study`}
                        onClick={() => {
                          setAnnouncement(null);
                          setRemoving({ studyId, studyTitle, userId: member.userId, personName: name });
                        }}
                      >
                        Remove
                      </Button>
                    </td>
                  )}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    );
  };

  return (
    <Panel
      id="members"
      title="Members"
      description={
        canManage
          ? 'Who works on this study. Staff see only the studies they are members of; their role here matches their staff role.'
          : 'Who works on this study. Only an admin adds or removes members.'
      }
      actions={
        canManage && (
          <Button
            variant="primary"
            onClick={() => {
              setAnnouncement(null);
              setAdding(true);
            }}
          >
            Add member
          </Button>
        )
      }
    >
      <div aria-live="polite" className="mb-3 empty:hidden">
        {announcement && <Notice tone="info">{announcement}</Notice>}
      </div>
      {body()}
      {canManage && (
        <>
          <ModalDialog open={adding} onClose={() => setAdding(false)} title={`Add a member to ${studyTitle}`}>
            {adding && (
              <AddMemberForm
                studyId={studyId}
                members={members.data?.items ?? []}
                onCancel={() => setAdding(false)}
                onAdded={(name) => {
                  setAdding(false);
                  setAnnouncement(`${name} was added to the study.`);
                }}
              />
            )}
          </ModalDialog>
          <RemoveMembershipDialog
            membership={removing}
            onClose={() => setRemoving(null)}
            onRemoved={(removed) => {
              setRemoving(null);
              setAnnouncement(`${removed.personName} was removed from the study.`);
            }}
          />
        </>
      )}
    </Panel>
  );
}
