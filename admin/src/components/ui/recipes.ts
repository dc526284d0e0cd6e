// Class recipes for every Headless UI primitive, in one place. Styled with v2 data-attribute variants.

export const buttonRecipe = {
  base: 'inline-flex shrink-0 items-center justify-center gap-1.5 rounded-md text-sm font-medium whitespace-nowrap transition-colors focus:outline-none data-focus:outline-2 data-focus:outline-offset-2 data-focus:outline-spruce data-disabled:cursor-not-allowed data-disabled:opacity-50',
  sizes: {
    regular: 'h-8 px-3',
    compact: 'h-7 px-2',
  },
  variants: {
    primary: 'bg-spruce text-ink-inverse data-hover:bg-spruce-strong data-active:bg-spruce-strong',
    secondary: 'border border-line-strong bg-surface text-ink data-hover:bg-sunken data-active:bg-sunken',
    danger: 'bg-danger text-ink-inverse data-hover:bg-danger-strong data-active:bg-danger-strong',
    quiet: 'text-spruce-ink data-hover:bg-spruce-soft data-active:bg-spruce-soft',
    onNight: 'border border-night-line text-night-ink data-hover:bg-night-line',
  },
} as const;

export const fieldRecipe = {
  field: 'flex flex-col gap-1',
  label: 'text-xs font-semibold text-ink',
  hint: 'text-xs text-ink-faint',
  error: 'text-xs font-medium text-danger',
};

export const inputRecipe =
  'block h-8 w-full rounded-md border border-line-strong bg-surface px-2.5 text-sm text-ink placeholder:text-ink-faint focus:outline-none data-focus:border-spruce data-focus:outline-2 data-focus:-outline-offset-1 data-focus:outline-spruce data-invalid:border-danger data-disabled:bg-sunken data-disabled:text-ink-muted';

export const listboxRecipe = {
  button:
    'flex h-8 w-full items-center justify-between gap-2 rounded-md border border-line-strong bg-surface px-2.5 text-left text-sm text-ink focus:outline-none data-focus:border-spruce data-focus:outline-2 data-focus:-outline-offset-1 data-focus:outline-spruce data-invalid:border-danger data-disabled:bg-sunken',
  options:
    'z-50 w-(--button-width) rounded-md border border-line bg-surface p-1 shadow-overlay [--anchor-gap:4px] focus:outline-none',
  option:
    'group flex cursor-default items-start gap-2 rounded-sm px-2 py-1.5 text-sm text-ink select-none data-focus:bg-spruce-soft data-selected:font-semibold',
  optionDescription: 'block text-xs font-normal text-ink-muted',
};

export const dialogRecipe = {
  backdrop: 'fixed inset-0 bg-night/45 transition duration-150 ease-out data-closed:opacity-0',
  frame: 'fixed inset-0 flex w-screen items-start justify-center overflow-y-auto p-4 pt-[12vh]',
  panel:
    'w-full max-w-md rounded-lg border border-line bg-surface shadow-overlay transition duration-150 ease-out data-closed:translate-y-1 data-closed:opacity-0',
  title: 'text-lg font-semibold text-ink',
  description: 'mt-1 text-sm text-ink-muted',
};

export const tableRecipe = {
  // `relative`: screen-reader-only text in a cell is positioned absolutely; without a positioned frame it is placed
  // against the page and widens it past a phone's screen instead of scrolling inside the frame.
  frame: 'relative overflow-x-auto rounded-lg border border-line bg-surface shadow-raised',
  table: 'w-full border-collapse text-sm',
  headCell:
    'border-b border-line bg-sunken px-3 py-2 text-left text-2xs font-semibold tracking-wide text-ink-muted uppercase',
  row: 'border-b border-line last:border-b-0 hover:bg-canvas',
  cell: 'px-3 py-1.5 align-middle',
};

export const badgeRecipe = {
  base: 'inline-flex items-center rounded-sm px-1.5 py-px text-xs font-medium',
  tones: {
    neutral: 'bg-sunken text-ink-muted',
    spruce: 'bg-spruce-soft text-spruce-ink',
    success: 'bg-success-soft text-success',
    caution: 'bg-caution-soft text-caution',
    danger: 'bg-danger-soft text-danger',
  },
} as const;

export const noticeRecipe = {
  base: 'rounded-md border px-3 py-2 text-sm',
  tones: {
    danger: 'border-danger/30 bg-danger-soft text-danger',
    caution: 'border-caution/30 bg-caution-soft text-caution',
    info: 'border-spruce/25 bg-spruce-soft text-spruce-ink',
  },
} as const;

export const textareaRecipe =
  'block min-h-20 w-full rounded-md border border-line-strong bg-surface px-2.5 py-1.5 text-sm text-ink placeholder:text-ink-faint focus:outline-none data-focus:border-spruce data-focus:outline-2 data-focus:-outline-offset-1 data-focus:outline-spruce data-invalid:border-danger data-disabled:bg-sunken data-disabled:text-ink-muted';

export const radioCardRecipe = {
  group: 'grid gap-2',
  option:
    'group flex cursor-pointer items-start gap-3 rounded-md border border-line bg-surface px-3 py-2.5 transition-colors focus:outline-none data-hover:border-line-strong data-checked:border-spruce data-checked:bg-spruce-soft data-focus:outline-2 data-focus:outline-offset-2 data-focus:outline-spruce data-disabled:cursor-not-allowed data-disabled:opacity-60',
  dot: 'mt-0.5 flex size-4 shrink-0 items-center justify-center rounded-full border border-line-strong bg-surface group-data-checked:border-spruce group-data-checked:bg-spruce',
  dotCenter: 'size-1.5 rounded-full bg-surface invisible group-data-checked:visible',
  label: 'text-sm font-semibold text-ink',
  description: 'mt-0.5 block text-xs text-ink-muted',
};

export const switchRecipe = {
  track:
    'group inline-flex h-5 w-9 shrink-0 cursor-pointer items-center rounded-full bg-line-strong transition-colors focus:outline-none data-checked:bg-spruce data-focus:outline-2 data-focus:outline-offset-2 data-focus:outline-spruce data-disabled:cursor-not-allowed data-disabled:opacity-50',
  thumb:
    'size-4 translate-x-0.5 rounded-full bg-surface shadow-raised transition-transform group-data-checked:translate-x-4.5',
};

export const checkboxRecipe =
  'group flex size-4 shrink-0 cursor-pointer items-center justify-center rounded-sm border border-line-strong bg-surface focus:outline-none data-checked:border-spruce data-checked:bg-spruce data-focus:outline-2 data-focus:outline-offset-2 data-focus:outline-spruce data-disabled:cursor-not-allowed data-disabled:opacity-50';

export const disclosureRecipe = {
  button:
    'group flex items-center gap-1.5 rounded-sm text-sm font-medium text-spruce-ink focus:outline-none data-hover:underline data-focus:outline-2 data-focus:outline-offset-2 data-focus:outline-spruce',
  chevron: 'size-3.5 transition-transform group-data-open:rotate-90',
  panel: 'mt-2',
};

export const panelRecipe = {
  frame: 'rounded-lg border border-line bg-surface shadow-raised',
  header: 'flex flex-wrap items-start justify-between gap-3 border-b border-line px-4 py-3',
  title: 'text-lg font-semibold text-ink',
  description: 'mt-0.5 max-w-prose text-sm text-ink-muted',
  body: 'px-4 py-4',
};

export const tabNavRecipe = {
  list: 'flex gap-1 border-b border-line',
  tab: '-mb-px border-b-2 px-3 py-2 text-sm font-medium transition-colors focus:outline-none focus-visible:outline-2 focus-visible:-outline-offset-2 focus-visible:outline-spruce',
  active: 'border-spruce text-ink',
  inactive: 'border-transparent text-ink-muted hover:border-line-strong hover:text-ink',
};

export const progressRecipe = {
  track: 'relative h-1.5 w-full overflow-hidden rounded-full bg-sunken',
  indeterminateBar:
    'absolute inset-y-0 w-1/3 rounded-full bg-spruce motion-safe:animate-[evenhand-indeterminate_1.4s_ease-in-out_infinite]',
};
