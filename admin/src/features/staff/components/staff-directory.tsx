import { Input } from '@headlessui/react';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Pager } from '@/components/ui/pager';
import { ModalDialog } from '@/components/ui/modal-dialog';
import { inputRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { useUrlSearch } from '@/hooks/use-url-search';
import { ApiError } from '@/lib/api-error';
import { useStaffUsers, type StaffUser } from '../api/get-staff-users';
import { CreateStaffUserForm } from './create-staff-user-form';
import { EditStaffUserForm } from './edit-staff-user-form';
import { StaffActivationDialog } from './staff-activation-dialog';
import { StaffTable } from './staff-table';

const pageSize = 20;

type OpenDialog =
  { kind: 'create' } | { kind: 'edit'; user: StaffUser } | { kind: 'activation'; user: StaffUser } | null;

export function StaffDirectory({ currentUserId }: { currentUserId: string }) {
  const { search, page, searchText, setSearchText, goToPage } = useUrlSearch();
  const [dialog, setDialog] = useState<OpenDialog>(null);
  // The person last opened for editing stays rendered while the edit dialog fades out.
  const [editing, setEditing] = useState<StaffUser | null>(null);
  const [announcement, setAnnouncement] = useState<string | null>(null);

  const staffUsers = useStaffUsers({ search, page, pageSize });
  const closeDialog = () => setDialog(null);
  const openDialog = (next: NonNullable<OpenDialog>) => {
    setAnnouncement(null);
    if (next.kind === 'edit') setEditing(next.user);
    setDialog(next);
  };

  return (
    <section aria-labelledby="staff-heading" className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 id="staff-heading" className="text-xl font-semibold">
            Staff
          </h1>
          <p className="text-sm text-ink-muted">
            Accounts for the people who run, analyse and review studies in this lab.
          </p>
        </div>
        <Button variant="primary" onClick={() => openDialog({ kind: 'create' })}>
          Add staff member
        </Button>
      </div>

      <div className="flex flex-wrap items-center gap-3">
        <label className="w-full max-w-xs">
          <span className="sr-only">Search staff by name or e-mail</span>
          <Input
            type="search"
            value={searchText}
            onChange={(event) => setSearchText(event.target.value)}
            placeholder="Search name or e-mail"
            className={inputRecipe}
          />
        </label>
        {staffUsers.isFetching && !staffUsers.isPending && <span className="text-xs text-ink-faint">Updating…</span>}
      </div>

      <div aria-live="polite" className="empty:hidden">
        {announcement && <Notice tone="info">{announcement}</Notice>}
      </div>

      {staffUsers.isPending ? (
        <LoadingState label="Loading staff…" />
      ) : staffUsers.isError ? (
        <ErrorState
          message={
            staffUsers.error instanceof ApiError ? staffUsers.error.message : 'The staff list could not be loaded.'
          }
          onRetry={() => void staffUsers.refetch()}
        />
      ) : staffUsers.data.items.length === 0 ? (
        page > 1 ? (
          <EmptyState
            title={`Page ${page} is empty`}
            action={<Button onClick={() => goToPage(1)}>Go to the first page</Button>}
          >
            The list is shorter than it was.
          </EmptyState>
        ) : search ? (
          <EmptyState title="No one matches">
            Nobody’s name or e-mail contains “{search}”. Check the spelling or clear the search.
          </EmptyState>
        ) : (
          <EmptyState
            title="No staff accounts yet"
            action={
              <Button variant="primary" onClick={() => openDialog({ kind: 'create' })}>
                Add staff member
              </Button>
            }
          >
            Add the coordinators, researchers and auditors who work on your studies.
          </EmptyState>
        )
      ) : (
        <>
          <StaffTable
            users={staffUsers.data.items}
            currentUserId={currentUserId}
            busy={staffUsers.isFetching}
            onEdit={(user) => openDialog({ kind: 'edit', user })}
            onToggleActive={(user) => openDialog({ kind: 'activation', user })}
          />
          <Pager
            label="Staff pages"
            noun={['person', 'people']}
            pageSize={pageSize}
            total={staffUsers.data.total}
            page={page}
            onPage={goToPage}
          />
        </>
      )}

      <ModalDialog
        open={dialog?.kind === 'create'}
        onClose={closeDialog}
        title="Add a staff member"
        description="They sign in on this site with their e-mail and the password you set."
      >
        <CreateStaffUserForm
          onCancel={closeDialog}
          onCreated={(user) => {
            closeDialog();
            setAnnouncement(`${user.name} was added as ${user.role}.`);
          }}
        />
      </ModalDialog>

      <ModalDialog open={dialog?.kind === 'edit'} onClose={closeDialog} title={`Edit ${editing?.name ?? ''}`}>
        {editing && (
          <EditStaffUserForm
            key={editing.id}
            user={editing}
            onCancel={closeDialog}
            onSaved={(user) => {
              closeDialog();
              setAnnouncement(`Changes to ${user.name} were saved.`);
            }}
          />
        )}
      </ModalDialog>

      <StaffActivationDialog
        user={dialog?.kind === 'activation' ? dialog.user : null}
        onClose={closeDialog}
        onChanged={(user) => {
          closeDialog();
          setAnnouncement(user.active ? `${user.name} was reactivated.` : `${user.name} was deactivated.`);
        }}
      />
    </section>
  );
}
