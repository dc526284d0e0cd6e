// The card form's own look: plain bordered inputs with visible labels, in a neutral palette of our
// own, tuned by CSS custom properties that `appearance.variables` and the element's `style` set.
// Not layered, so it wins over a host page's reset layer (Tailwind's preflight lives in @layer base).

export const CARD_STYLE_ELEMENT_ID = 'payments-fake-card-element-style';

export const CARD_ELEMENT_CSS = `
.pfk-card {
  --pfk-text: #1f2933;
  --pfk-muted: #52606d;
  --pfk-placeholder: #7b8794;
  --pfk-background: #ffffff;
  --pfk-border: #9aa5b1;
  --pfk-accent: #2d6a8f;
  --pfk-danger: #b42318;
  --pfk-font-family: inherit;
  --pfk-font-size: 15px;
  --pfk-radius: 6px;
  --pfk-gap: 12px;
  display: grid;
  gap: var(--pfk-gap);
  padding: var(--pfk-gap);
  border: 1px dashed var(--pfk-border);
  border-radius: var(--pfk-radius);
  font-family: var(--pfk-font-family);
  font-size: var(--pfk-font-size);
  color: var(--pfk-text);
  line-height: 1.4;
}
.pfk-card * { box-sizing: border-box; }
.pfk-card__row {
  display: grid;
  grid-template-columns: repeat(auto-fit, minmax(7.5em, 1fr));
  gap: var(--pfk-gap);
}
.pfk-card__field { display: grid; gap: 4px; min-width: 0; }
.pfk-card__label { font-size: 0.87em; font-weight: 600; color: var(--pfk-muted); }
.pfk-card__input {
  width: 100%;
  margin: 0;
  padding: 0.55em 0.7em;
  font: inherit;
  color: var(--pfk-text);
  background: var(--pfk-background);
  border: 1px solid var(--pfk-border);
  border-radius: var(--pfk-radius);
  font-variant-numeric: tabular-nums;
  letter-spacing: 0.02em;
}
.pfk-card__input::placeholder { color: var(--pfk-placeholder); opacity: 1; }
.pfk-card__input:focus { outline: 2px solid var(--pfk-accent); outline-offset: 1px; border-color: var(--pfk-accent); }
.pfk-card__input[aria-invalid="true"] { border-color: var(--pfk-danger); color: var(--pfk-danger); }
.pfk-card__input[aria-invalid="true"]:focus { outline-color: var(--pfk-danger); }
.pfk-card__input:disabled { opacity: 0.6; cursor: not-allowed; }
.pfk-card__hint { margin: 0; font-size: 0.8em; color: var(--pfk-muted); }
.pfk-card__notice { margin: 0; font-size: 0.85em; font-weight: 600; color: var(--pfk-muted); }
`;
