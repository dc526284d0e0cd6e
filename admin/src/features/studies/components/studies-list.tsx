import { Badge, type BadgeTone } from '@/components/ui/badge';
import { tableRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useStudies, type StudySummary } from '../api/get-studies';

const statusLabels: Record<StudySummary['status'], { label: string; tone: BadgeTone }> = {
  draft: { label: 'Draft', tone: 'neutral' },
  recruiting: { label: 'Recruiting', tone: 'success' },
  paused: { label: 'Paused', tone: 'caution' },
  closed: { label: 'Closed', tone: 'spruce' },
};

const designLabels: Record<StudySummary['design'], string> = {
  between: 'Between subjects',
  within: 'Within subjects',
};

export function StudiesList() {
  const studies = useStudies();

  if (studies.isPending) return <LoadingState label="Loading studies…" />;
  if (studies.isError) {
    return (
      <ErrorState
        message={studies.error instanceof ApiError ? studies.error.message : 'The studies could not be loaded.'}
        onRetry={() => void studies.refetch()}
      />
    );
  }
  if (studies.data.items.length === 0) {
    return (
      <EmptyState title="No studies yet">
        Studies you are a member of appear here. Setting up a study arrives in a later release of Evenhand.
      </EmptyState>
    );
  }
  return (
    <div className={tableRecipe.frame}>
      <table className={tableRecipe.table}>
        <caption className="sr-only">Your studies</caption>
        <thead>
          <tr>
            <th scope="col" className={tableRecipe.headCell}>Title</th>
            <th scope="col" className={tableRecipe.headCell}>Link name</th>
            <th scope="col" className={tableRecipe.headCell}>Design</th>
            <th scope="col" className={tableRecipe.headCell}>Status</th>
          </tr>
        </thead>
        <tbody>
          {studies.data.items.map((study) => (
            <tr key={study.id} className={tableRecipe.row}>
              <td className={`${tableRecipe.cell} font-medium`}>{study.title}</td>
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
