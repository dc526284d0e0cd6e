import { cx } from '@/components/ui/cx';

// Typography for the rendered form; the api renders the Markdown and sanitises the HTML.
const proseClass = cx(
  'text-sm leading-6 text-ink',
  '[&_h1]:mb-2 [&_h1]:text-xl [&_h1]:font-semibold',
  '[&_h2]:mt-5 [&_h2]:mb-1.5 [&_h2]:text-lg [&_h2]:font-semibold',
  '[&_h3]:mt-4 [&_h3]:mb-1 [&_h3]:font-semibold',
  '[&_p]:my-2 [&_ul]:my-2 [&_ul]:list-disc [&_ul]:pl-5 [&_ol]:my-2 [&_ol]:list-decimal [&_ol]:pl-5 [&_li]:my-0.5',
  '[&_a]:text-spruce-ink [&_a]:underline [&_strong]:font-semibold',
  '[&_table]:my-2 [&_table]:w-full [&_td]:border [&_td]:border-line [&_td]:px-2 [&_td]:py-1 [&_th]:border [&_th]:border-line [&_th]:bg-sunken [&_th]:px-2 [&_th]:py-1 [&_th]:text-left',
);

export function ConsentPreview({ html, label, className }: { html: string; label: string; className?: string }) {
  return (
    <div
      role="region"
      aria-label={label}
      tabIndex={0}
      className={cx('overflow-y-auto rounded-md border border-line bg-surface px-5 py-4', proseClass, className)}
      // The api sanitises the rendered Markdown before sending previewHtml.
      dangerouslySetInnerHTML={{ __html: html }}
    />
  );
}
