import { useEffect, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { useDebouncedValue } from '@/hooks/use-debounced-value';
import { parsePageParam } from '@/lib/paging';

/**
 * A list's search box and page kept in the URL (`q`, `page`), so a filtered page can be shared or reloaded.
 * What is typed reaches the URL after a pause, and a new search starts again from page 1.
 */
export function useUrlSearch(delayMs = 300) {
  const [searchParams, setSearchParams] = useSearchParams();
  const search = searchParams.get('q') ?? '';
  const page = parsePageParam(searchParams.get('page'));
  const [searchText, setSearchText] = useState(search);
  const debouncedSearch = useDebouncedValue(searchText.trim(), delayMs);

  useEffect(() => {
    if (debouncedSearch === search) return;
    setSearchParams(
      (params) => {
        const next = new URLSearchParams(params);
        if (debouncedSearch) next.set('q', debouncedSearch);
        else next.delete('q');
        next.delete('page');
        return next;
      },
      { replace: true },
    );
  }, [debouncedSearch, search, setSearchParams]);

  const goToPage = (nextPage: number) =>
    setSearchParams((params) => {
      const next = new URLSearchParams(params);
      if (nextPage > 1) next.set('page', String(nextPage));
      else next.delete('page');
      return next;
    });

  return { searchParams, setSearchParams, search, page, searchText, setSearchText, goToPage };
}
