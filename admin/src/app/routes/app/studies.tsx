import { StudiesList } from '@/features/studies/components/studies-list';
import { RequireArea } from './require-area';

export function Component() {
  return (
    <RequireArea area="studies">
      <title>Studies · Evenhand</title>
      <section aria-labelledby="studies-heading" className="flex flex-col gap-4">
        <div>
          <h1 id="studies-heading" className="text-xl font-semibold">Studies</h1>
          <p className="text-sm text-ink-muted">The studies you are a member of.</p>
        </div>
        <StudiesList />
      </section>
    </RequireArea>
  );
}
