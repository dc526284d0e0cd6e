import { PageLayout } from '@/components/layout/page-layout';
import { ButtonLink } from '@/components/ui/button';

export function NotFoundContent() {
  return (
    <section className="flex flex-col gap-5">
      <title>Page not found · Evenhand</title>
      <p className="text-fine font-semibold tracking-wide text-clay-ink uppercase">Page not found</p>
      <h1 className="text-title font-bold">We could not find that page</h1>
      <p className="text-lead">
        The address may be mistyped, or the page has moved. If you followed a link from an e-mail, try opening it again
        from the e-mail.
      </p>
      <ButtonLink to="/studies" wide>
        Go to your studies
      </ButtonLink>
    </section>
  );
}

export function NotFoundRoute() {
  return (
    <PageLayout>
      <NotFoundContent />
    </PageLayout>
  );
}
