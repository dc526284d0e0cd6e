import { Button } from '@/components/ui/button';
import { pageWindow } from '@/lib/paging';

interface PagerProps {
  /** Names the navigation for screen readers, e.g. "Roster pages". */
  label: string;
  total: number;
  page: number;
  pageSize: number;
  /** What the rows are, for the one-page summary: ['person', 'people']. */
  noun: [singular: string, plural: string];
  onPage: (page: number) => void;
}

/** The paging bar under every paged table: where you are, and Previous / Next. */
export function Pager({ label, total, page, pageSize, noun, onPage }: PagerProps) {
  const rows = pageWindow(page, pageSize, total);
  return (
    <nav aria-label={label} className="flex items-center justify-between gap-3 text-sm text-ink-muted">
      <p aria-live="polite">
        {rows.pageCount === 1
          ? `${total} ${total === 1 ? noun[0] : noun[1]}`
          : rows.firstRow === 0
            ? `No rows on page ${page}`
            : `${rows.firstRow}–${rows.lastRow} of ${total}`}
      </p>
      <div className="flex items-center gap-2">
        <span className="tabular-nums">
          Page {page} of {rows.pageCount}
        </span>
        <Button onClick={() => onPage(page - 1)} disabled={!rows.hasPrevious}>
          Previous
        </Button>
        <Button onClick={() => onPage(page + 1)} disabled={!rows.hasNext}>
          Next
        </Button>
      </div>
    </nav>
  );
}
