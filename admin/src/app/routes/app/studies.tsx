import { Link, useSearchParams } from 'react-router-dom';
import { tabNavRecipe } from '@/components/ui/recipes';
import { buttonRecipe } from '@/components/ui/recipes';
import { cx } from '@/components/ui/cx';
import { StudiesList } from '@/features/studies/components/studies-list';
import { mayDesignStudy } from '@/lib/study-permissions';
import { useStaffSession } from '../../session-context';
import { RequireArea } from './require-area';

const newStudyClass = cx(buttonRecipe.base, buttonRecipe.sizes.regular, buttonRecipe.variants.primary);

export function Component() {
  const { me } = useStaffSession();
  const [searchParams] = useSearchParams();
  const archived = searchParams.get('archived') === '1';
  const newStudy = mayDesignStudy(me.role) ? (
    <Link to="/studies/new" className={newStudyClass}>
      New study
    </Link>
  ) : undefined;
  return (
    <RequireArea area="studies">
      <title>Studies · Evenhand</title>
      <section aria-labelledby="studies-heading" className="flex flex-col gap-4">
        <div className="flex flex-wrap items-end justify-between gap-3">
          <div>
            <h1 id="studies-heading" className="text-xl font-semibold">
              Studies
            </h1>
            <p className="text-sm text-ink-muted">The studies you are a member of.</p>
          </div>
          {newStudy}
        </div>
        <nav aria-label="Which studies" className={tabNavRecipe.list}>
          <Link
            to="/studies"
            aria-current={archived ? undefined : 'page'}
            className={cx(tabNavRecipe.tab, archived ? tabNavRecipe.inactive : tabNavRecipe.active)}
          >
            Current
          </Link>
          <Link
            to="/studies?archived=1"
            aria-current={archived ? 'page' : undefined}
            className={cx(tabNavRecipe.tab, archived ? tabNavRecipe.active : tabNavRecipe.inactive)}
          >
            Archive
          </Link>
        </nav>
        <StudiesList newStudyAction={newStudy} archived={archived} />
      </section>
    </RequireArea>
  );
}
