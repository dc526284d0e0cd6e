// Class recipes for every Headless UI primitive, in one place. Styled with v2 data-attribute variants.

export const buttonRecipe = {
  base:
    'inline-flex shrink-0 items-center justify-center gap-1.5 rounded-md text-sm font-medium whitespace-nowrap transition-colors focus:outline-none data-focus:outline-2 data-focus:outline-offset-2 data-focus:outline-spruce data-disabled:cursor-not-allowed data-disabled:opacity-50',
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
    'z-50 w-(--button-width) rounded-md border border-line bg-surface p-1 shadow-overlay [--anchor-gap:4px] focus:outline-none transition duration-100 ease-out data-closed:opacity-0',
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
  frame: 'overflow-x-auto rounded-lg border border-line bg-surface shadow-raised',
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
