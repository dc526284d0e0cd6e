import { Link } from 'react-router-dom';
import { Badge } from '@/components/ui/badge';
import { tableRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useStudies } from '../api/get-studies';
import { studyDesignLabels as designLabels, studyStatusLabels as statusLabels } from './study-labels';

export interface StudiesListProps {
  /** Shown in the empty state for people who may create studies. */
  newStudyAction?: React.ReactNode;
  /** The archive of closed studies instead of the current ones. */
  archived?: boolean;
}

export function StudiesList({ newStudyAction, archived = false }: StudiesListProps) {
  const studies = useStudies(archived);

  if (studies.isPending) return <LoadingState label="Loading studies…" />;
  if (studies.isError) {
    return (
      <ErrorState
        message={studies.error instanceof ApiError ? studies.error.message : 'The studies could not be loaded.'}
        onRetry={() => void studies.refetch()}
      />
    );
  }
  if (studies.data.items.length === 0 && archived) {
    return (
      <EmptyState title="The archive is empty">
        Closed studies you archive appear here, with all their records.
      </EmptyState>
    );
  }
  if (studies.data.items.length === 0) {
    return (
      <EmptyState title="No studies yet" action={newStudyAction}>
        Studies you are a member of appear here. Whoever creates a study becomes its first member; a lab admin adds
        colleagues.
      </EmptyState>
    );
  }
  return (
    <div className={tableRecipe.frame}>
      <table className={tableRecipe.table}>
        <caption className="sr-only">{archived ? 'Archived studies' : 'Your studies'}</caption>
        <thead>
          <tr>
            <th scope="col" className={tableRecipe.headCell}>
              Title
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Link name
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Design
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Status
            </th>
          </tr>
        </thead>
        <tbody>
          {studies.data.items.map((study) => (
            <tr key={study.id} className={tableRecipe.row}>
              <td className={`${tableRecipe.cell} font-medium`}>
                <Link to={`/studies/${study.id}`} className="text-spruce-ink underline-offset-2 hover:underline">
                  {study.title}
                </Link>
              </td>
              <td className={`${tableRecipe.cell} font-mono text-xs text-ink-muted`}>{study.slug}</td>
              <td className={`${tableRecipe.cell} text-ink-muted`}>{designLabels[study.design]}</td>
              <td className={tableRecipe.cell}>
                <Badge tone={statusLabels[study.status].tone}>{statusLabels[study.status].label}</Badge>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
