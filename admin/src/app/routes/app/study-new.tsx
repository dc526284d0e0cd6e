import { Link, useNavigate } from 'react-router-dom';
import { CreateStudyForm } from '@/features/studies/components/create-study-form';
import { mayDesignStudy } from '@/lib/study-permissions';
import { EmptyState } from '@/components/ui/states';
import { useStaffSession } from '../../session-context';
import { RequireArea } from './require-area';

export function Component() {
  const { me } = useStaffSession();
  const navigate = useNavigate();
  return (
    <RequireArea area="studies">
      <title>New study · Evenhand</title>
      <section aria-labelledby="new-study-heading" className="mx-auto flex max-w-3xl flex-col gap-4">
        <div>
          <Link to="/studies" className="text-sm text-spruce-ink underline-offset-2 hover:underline">
            ← All studies
          </Link>
          <h1 id="new-study-heading" className="mt-1 text-xl font-semibold">
            New study
          </h1>
          <p className="text-sm text-ink-muted">
            Start with what the study is and how it compares conditions. Conditions, steps, pay and the assignment
            scheme come next, on the study’s set-up page. You become the study’s first member.
          </p>
        </div>
        {mayDesignStudy(me.role) ? (
          <div className="rounded-lg border border-line bg-surface p-5 shadow-raised">
            <CreateStudyForm
              onCancel={() => navigate('/studies')}
              onCreated={(study) => navigate(`/studies/${study.id}/setup`)}
            />
          </div>
        ) : (
          <EmptyState title="Not part of your role">
            Coordinators and researchers create studies. Ask one of them to add you to a study.
          </EmptyState>
        )}
      </section>
    </RequireArea>
  );
}
