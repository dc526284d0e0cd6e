import { DropoutWatch } from '@/features/watch/components/dropout-watch';
import { useStudySession } from '../../study-context';

export function Component() {
  const { study, me } = useStudySession();
  return (
    <div className="flex flex-col gap-5">
      <title>{`Dropout watch · ${study.title} · Evenhand`}</title>
      <DropoutWatch
        studyId={study.id}
        canEditAlerts={me.role === 'researcher' || me.role === 'admin'}
        canExport={me.role === 'researcher' || me.role === 'coordinator' || me.role === 'admin'}
      />
    </div>
  );
}
