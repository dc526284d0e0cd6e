import { EmptyState } from '@/components/ui/states';
import { RequireArea } from './require-area';

export function Component() {
  return (
    <RequireArea area="audit">
      <title>Audit trail · Evenhand</title>
      <section aria-labelledby="audit-heading" className="flex flex-col gap-4">
        <div>
          <h1 id="audit-heading" className="text-xl font-semibold">Audit trail</h1>
          <p className="text-sm text-ink-muted">Every sign-in, consent signature and change, in a hash-chained log you can check.</p>
        </div>
        <EmptyState title="The audit view arrives in a later release">
          Events are already being recorded from the first sign-in. Browsing them and running the integrity check will be available
          here.
        </EmptyState>
      </section>
    </RequireArea>
  );
}
