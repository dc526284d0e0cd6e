export interface PageWindow {
  /** 1-based position of the first row shown; 0 when the page shows no rows. */
  firstRow: number;
  lastRow: number;
  pageCount: number;
  hasPrevious: boolean;
  hasNext: boolean;
}

export function pageWindow(page: number, pageSize: number, total: number): PageWindow {
  if (!Number.isInteger(page) || page < 1) throw new RangeError(`page must be a whole number from 1, got ${page}`);
  if (!Number.isInteger(pageSize) || pageSize < 1)
    throw new RangeError(`pageSize must be a whole number from 1, got ${pageSize}`);
  if (!Number.isInteger(total) || total < 0) throw new RangeError(`total must be a whole number from 0, got ${total}`);

  const pageCount = Math.max(1, Math.ceil(total / pageSize));
  const skipped = (page - 1) * pageSize;
  // A page past the end (e.g. after rows were removed) shows nothing rather than a backwards range.
  const firstRow = skipped < total ? skipped + 1 : 0;
  const lastRow = firstRow === 0 ? 0 : Math.min(page * pageSize, total);
  return { firstRow, lastRow, pageCount, hasPrevious: page > 1, hasNext: page < pageCount };
}

/** Reads a page number from a URL parameter; anything that is not a whole number from 1 means page 1. */
export function parsePageParam(value: string | null): number {
  if (value === null || !/^\d+$/.test(value)) return 1;
  const page = Number(value);
  return page >= 1 ? page : 1;
}
