// The `card` element of the stand-in: instead of the provider's hosted frame it renders plain,
// labelled inputs (card number, expiry, CVC, optional postal code) into the mount node, and speaks
// the element API the app uses (mount, unmount, on/once/off, focus, blur, clear, update, destroy;
// https://docs.stripe.com/js/element). What is typed is checked with ../cards/card-checks.

import type {
  Appearance,
  StripeCardElement,
  StripeCardElementChangeEvent,
  StripeCardElementOptions,
  StripeCardElementUpdateOptions,
  StripeElementClasses,
} from '@stripe/stripe-js';
import {
  type CardEntry,
  type CardEntryCheck,
  type CardField,
  checkCardEntry,
  digitsOf,
  parseExpiry,
  visibleProblem,
} from '../cards/card-checks';
import { caretAfterDigits, formatCardNumber, formatCvc, formatExpiry } from '../cards/card-input-format';
import { CARD_ELEMENT_CSS, CARD_STYLE_ELEMENT_ID } from './card-element-styles';
import { IntegrationError } from './integration-error';

type CardEventType = 'change' | 'ready' | 'focus' | 'blur' | 'escape' | 'networkschange' | 'loaderror';
type Handler = (event: never) => unknown;

/** The card as typed, for confirmCardPayment. */
export interface TypedCard {
  check: CardEntryCheck;
  number: string;
  expMonth: number;
  expYear: number;
  cvc: string;
  postalCode: string | undefined;
}

// Class names the provider's library puts on the mount node (https://docs.stripe.com/js/elements_object/create_element, `classes`).
const DEFAULT_CLASSES: Required<Omit<StripeElementClasses, 'webkitAutofill'>> = {
  base: 'StripeElement',
  complete: 'StripeElement--complete',
  empty: 'StripeElement--empty',
  focus: 'StripeElement--focus',
  invalid: 'StripeElement--invalid',
};

const FIELD_SPECS: Record<CardField, { label: string; autocomplete: string; placeholder: string; inputMode: string }> =
  {
    number: {
      label: 'Card number',
      autocomplete: 'cc-number',
      placeholder: 'The long number on the card',
      inputMode: 'numeric',
    },
    expiry: { label: 'Expiry date (MM/YY)', autocomplete: 'cc-exp', placeholder: 'month/year', inputMode: 'numeric' },
    cvc: { label: 'Security code (CVC)', autocomplete: 'cc-csc', placeholder: '3 or 4 digits', inputMode: 'numeric' },
    postalCode: {
      label: 'Postal code',
      autocomplete: 'postal-code',
      placeholder: 'Of the card’s bill',
      inputMode: 'text',
    },
  };

// appearance.variables (https://docs.stripe.com/elements/appearance-api) → our custom properties.
const APPEARANCE_VARIABLES: Record<string, string> = {
  colorText: '--pfk-text',
  colorTextSecondary: '--pfk-muted',
  colorTextPlaceholder: '--pfk-placeholder',
  colorBackground: '--pfk-background',
  colorPrimary: '--pfk-accent',
  colorDanger: '--pfk-danger',
  fontFamily: '--pfk-font-family',
  fontSizeBase: '--pfk-font-size',
  borderRadius: '--pfk-radius',
  spacingUnit: '--pfk-gap',
};

let elementCount = 0;

function ensureStyles(doc: Document): void {
  if (doc.getElementById(CARD_STYLE_ELEMENT_ID)) return;
  const style = doc.createElement('style');
  style.id = CARD_STYLE_ELEMENT_ID;
  style.textContent = CARD_ELEMENT_CSS;
  (doc.head ?? doc.documentElement).appendChild(style);
}

function sameEvent(a: StripeCardElementChangeEvent | undefined, b: StripeCardElementChangeEvent): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

export class CardElementStandIn implements StripeCardElement {
  readonly #id = `pfk-card-${++elementCount}`;
  readonly #handlers = new Map<string, Set<Handler>>();
  readonly #onceHandlers = new WeakSet<Handler>();
  #appearance: Appearance | undefined;
  readonly #onDestroy: () => void;
  #options: StripeCardElementOptions;
  #entry: CardEntry = { number: '', expiry: '', cvc: '', postalCode: '' };
  #left = new Set<CardField>();
  #focused: CardField | undefined;
  #mountNode: HTMLElement | undefined;
  #root: HTMLElement | undefined;
  #inputs = new Map<CardField, HTMLInputElement>();
  #destroyed = false;
  #lastChange: StripeCardElementChangeEvent | undefined;

  constructor(
    options: StripeCardElementOptions | undefined,
    appearance: Appearance | undefined,
    onDestroy: () => void,
  ) {
    this.#options = { ...options };
    this.#appearance = appearance;
    this.#onDestroy = onDestroy;
    this.#entry.postalCode = options?.value?.postalCode ?? '';
  }

  /** Reads the card of one of our elements for confirmation; undefined for anything else. */
  static typedCard(element: unknown, now: Date): TypedCard | undefined {
    if (!(element instanceof CardElementStandIn)) return undefined;
    const check = element.#check(now);
    const expiry = parseExpiry(element.#entry.expiry);
    return {
      check,
      number: digitsOf(element.#entry.number),
      expMonth: expiry?.month ?? 0,
      expYear: expiry?.year ?? 0,
      cvc: element.#entry.cvc,
      postalCode: element.#postalCodeShown() ? element.#entry.postalCode.trim() : undefined,
    };
  }

  /** After a refused submit, show the first problem at once, as if the payer had left every field. */
  static revealProblems(element: CardElementStandIn): void {
    for (const field of element.#inputs.keys()) element.#left.add(field);
    element.#refresh(true);
  }

  static isMounted(element: CardElementStandIn): boolean {
    return element.#mountNode !== undefined;
  }

  /** elements.update({appearance}) restyles the element in place. */
  static setAppearance(element: CardElementStandIn, appearance: Appearance | undefined): void {
    element.#appearance = appearance;
    if (element.#root) element.#applyOptions();
  }

  mount(domElement: string | HTMLElement): void {
    this.#assertUsable('mount');
    if (this.#mountNode)
      throw new IntegrationError('This card element is already mounted. Call unmount() before mounting it again.');
    const node = typeof domElement === 'string' ? document.querySelector(domElement) : domElement;
    if (typeof domElement === 'string' && !node) {
      throw new IntegrationError(
        `The selector ${domElement} matches no element on the page, so the card element cannot be mounted.`,
      );
    }
    if (!(node instanceof HTMLElement)) throw new IntegrationError('mount() takes a CSS selector or a DOM element.');
    ensureStyles(node.ownerDocument);
    this.#mountNode = node;
    this.#render();
    // The provider's element reports `ready` once its frame has loaded, always after mount() returns.
    setTimeout(() => {
      if (this.#mountNode === node) this.#emit('ready', { elementType: 'card' });
    }, 0);
  }

  unmount(): void {
    this.#assertUsable('unmount');
    this.#root?.remove();
    this.#root = undefined;
    this.#inputs.clear();
    if (this.#mountNode) this.#mountNode.classList.remove(...Object.values(this.#classes()));
    this.#mountNode = undefined;
    this.#focused = undefined;
  }

  destroy(): void {
    this.#assertUsable('destroy');
    if (this.#mountNode) this.unmount();
    this.#destroyed = true;
    this.#handlers.clear();
    this.#onDestroy();
  }

  focus(): void {
    this.#assertUsable('focus');
    this.#inputs.get('number')?.focus();
  }

  blur(): void {
    this.#assertUsable('blur');
    if (this.#focused) this.#inputs.get(this.#focused)?.blur();
  }

  clear(): void {
    this.#assertUsable('clear');
    this.#entry = { number: '', expiry: '', cvc: '', postalCode: '' };
    this.#left.clear();
    for (const [field, input] of this.#inputs) input.value = this.#entry[field];
    this.#refresh(true);
  }

  update(options: StripeCardElementUpdateOptions): void {
    this.#assertUsable('update');
    const postalCodeWasShown = this.#postalCodeShown();
    this.#options = { ...this.#options, ...options, classes: { ...this.#options.classes, ...options.classes } };
    if (options.value?.postalCode !== undefined) this.#entry.postalCode = options.value.postalCode;
    if (this.#mountNode) {
      const focused = this.#focused;
      if (postalCodeWasShown !== this.#postalCodeShown()) this.#render();
      else this.#applyOptions();
      for (const [field, input] of this.#inputs) input.value = this.#entry[field];
      if (focused) this.#inputs.get(focused)?.focus();
    }
    this.#refresh(false);
  }

  on(eventType: CardEventType, handler: (event: never) => unknown): this {
    this.#assertUsable('on');
    if (typeof handler !== 'function') throw new IntegrationError(`on('${eventType}') needs a handler function.`);
    let set = this.#handlers.get(eventType);
    if (!set) this.#handlers.set(eventType, (set = new Set()));
    set.add(handler);
    return this;
  }

  once(eventType: CardEventType, handler: (event: never) => unknown): this {
    this.#onceHandlers.add(handler);
    return this.on(eventType, handler);
  }

  off(eventType: CardEventType, handler?: (event: never) => unknown): this {
    if (handler) this.#handlers.get(eventType)?.delete(handler);
    else this.#handlers.delete(eventType);
    return this;
  }

  #assertUsable(method: string): void {
    if (this.#destroyed)
      throw new IntegrationError(`This card element was destroyed; ${method}() cannot be used. Create a new element.`);
  }

  #postalCodeShown(): boolean {
    return this.#options.hidePostalCode !== true;
  }

  #classes(): Required<Omit<StripeElementClasses, 'webkitAutofill'>> {
    return { ...DEFAULT_CLASSES, ...this.#options.classes } as Required<Omit<StripeElementClasses, 'webkitAutofill'>>;
  }

  #check(now = new Date()): CardEntryCheck {
    return checkCardEntry(this.#entry, { now, postalCodeShown: this.#postalCodeShown() });
  }

  #emit(eventType: CardEventType, event: object): void {
    for (const handler of [...(this.#handlers.get(eventType) ?? [])]) {
      if (this.#onceHandlers.has(handler)) this.#handlers.get(eventType)?.delete(handler);
      try {
        (handler as (event: object) => unknown)(event);
      } catch (error) {
        // A failing handler must not stop the form; report it as the page's own error.
        setTimeout(() => {
          throw error;
        }, 0);
      }
    }
  }

  #render(): void {
    const node = this.#mountNode as HTMLElement;
    this.#root?.remove();
    this.#inputs.clear();
    const doc = node.ownerDocument;
    const root = doc.createElement('div');
    root.className = 'pfk-card';
    root.setAttribute('role', 'group');
    root.setAttribute('aria-label', 'Card details');

    const field = (name: CardField): HTMLElement => {
      const spec = FIELD_SPECS[name];
      const wrapper = doc.createElement('div');
      wrapper.className = `pfk-card__field pfk-card__field--${name}`;
      const label = doc.createElement('label');
      label.className = 'pfk-card__label';
      label.htmlFor = `${this.#id}-${name}`;
      label.textContent = spec.label;
      const input = doc.createElement('input');
      input.className = 'pfk-card__input';
      input.id = `${this.#id}-${name}`;
      input.type = 'text';
      input.inputMode = spec.inputMode;
      input.setAttribute('autocomplete', spec.autocomplete);
      input.placeholder = spec.placeholder;
      input.spellcheck = false;
      input.setAttribute('autocorrect', 'off');
      input.setAttribute('aria-invalid', 'false');
      // No name attribute: card details never travel with the host page's own form.
      input.value = this.#entry[name];
      this.#wire(name, input);
      this.#inputs.set(name, input);
      wrapper.append(label, input);
      return wrapper;
    };

    // Built in form order: the inputs map keeps it for moving between fields.
    // Says first what this form is: the local stand-in, which charges nothing.
    const notice = doc.createElement('p');
    notice.className = 'pfk-card__notice';
    notice.textContent = 'Local payment stand-in: no card is charged and nothing leaves this computer.';
    const numberField = field('number');
    const row = doc.createElement('div');
    row.className = 'pfk-card__row';
    row.append(field('expiry'), field('cvc'));
    if (this.#postalCodeShown()) row.append(field('postalCode'));
    const hint = doc.createElement('p');
    hint.className = 'pfk-card__hint';
    hint.textContent = 'Sample card numbers, one for each outcome, are listed in payments-fake/README.md.';
    root.append(notice, numberField, row, hint);
    node.append(root);
    this.#root = root;
    this.#applyOptions();
    this.#refresh(false);
  }

  #applyOptions(): void {
    const root = this.#root as HTMLElement;
    const variables = this.#appearance?.variables as Record<string, unknown> | undefined;
    for (const [name, property] of Object.entries(APPEARANCE_VARIABLES)) {
      const value = variables?.[name];
      if (typeof value === 'string' || typeof value === 'number') root.style.setProperty(property, String(value));
    }
    const base = this.#options.style?.base;
    const fromStyle: [unknown, string][] = [
      [base?.color, '--pfk-text'],
      [base?.fontFamily, '--pfk-font-family'],
      [base?.fontSize, '--pfk-font-size'],
      [base?.['::placeholder']?.color, '--pfk-placeholder'],
      [this.#options.style?.invalid?.color, '--pfk-danger'],
    ];
    for (const [value, property] of fromStyle) if (typeof value === 'string') root.style.setProperty(property, value);
    for (const input of this.#inputs.values()) input.disabled = this.#options.disabled === true;
  }

  #wire(name: CardField, input: HTMLInputElement): void {
    input.addEventListener('input', () => this.#edited(name, input));
    input.addEventListener('focus', () => {
      const wasFocused = this.#focused !== undefined;
      this.#focused = name;
      if (!wasFocused) this.#emit('focus', { elementType: 'card' });
      this.#refresh(false);
    });
    input.addEventListener('blur', (event) => {
      this.#left.add(name);
      const next = event.relatedTarget;
      const stillInside = next instanceof Node && this.#root?.contains(next) === true;
      this.#focused = undefined;
      if (!stillInside) this.#emit('blur', { elementType: 'card' });
      this.#refresh(false);
    });
    input.addEventListener('keydown', (event) => {
      if (event.key === 'Escape') this.#emit('escape', { elementType: 'card' });
      // Backspace in an empty field goes back to the one before, as on a printed form filled left to right.
      if (event.key === 'Backspace' && input.value === '' && name !== 'number') {
        const order = [...this.#inputs.keys()];
        const previous = this.#inputs.get(order[order.indexOf(name) - 1] ?? 'number');
        if (previous && previous !== input) {
          event.preventDefault();
          previous.focus();
          previous.setSelectionRange(previous.value.length, previous.value.length);
        }
      }
    });
  }

  #edited(name: CardField, input: HTMLInputElement): void {
    const raw = input.value;
    const caret = input.selectionStart ?? raw.length;
    const caretAtEnd = caret >= raw.length;
    const before = this.#check().fields[name].status;
    let formatted = raw;
    if (name === 'number') formatted = formatCardNumber(raw);
    if (name === 'expiry') formatted = formatExpiry(raw);
    if (name === 'cvc') formatted = formatCvc(raw, this.#check().brand);
    if (name === 'postalCode') formatted = raw.slice(0, 10);
    if (formatted !== raw) {
      const digitsBefore = digitsOf(raw.slice(0, caret)).length;
      const padded = Math.max(0, digitsOf(formatted).length - digitsOf(raw).length);
      input.value = formatted;
      const position =
        name === 'postalCode' ? Math.min(caret, formatted.length) : caretAfterDigits(formatted, digitsBefore + padded);
      input.setSelectionRange(position, position);
    }
    this.#entry[name] = formatted;
    if (name === 'number') {
      // A brand change can shorten the security code (4 digits only on American Express).
      const cvc = formatCvc(this.#entry.cvc, this.#check().brand);
      if (cvc !== this.#entry.cvc) {
        this.#entry.cvc = cvc;
        const cvcInput = this.#inputs.get('cvc');
        if (cvcInput) cvcInput.value = cvc;
      }
    }
    this.#refresh(true);
    const after = this.#check().fields[name].status;
    if (after === 'complete' && before !== 'complete' && caretAtEnd) {
      const order = [...this.#inputs.keys()];
      this.#inputs.get(order[order.indexOf(name) + 1] as CardField)?.focus();
    }
  }

  /** Updates invalid markers and the mount node's classes; sends `change` when the state moved. */
  #refresh(valueChanged: boolean): void {
    const check = this.#check();
    const shown = visibleProblem(check, this.#left, this.#focused);
    for (const [field, input] of this.#inputs) input.setAttribute('aria-invalid', String(shown?.field === field));
    const node = this.#mountNode;
    if (node) {
      const classes = this.#classes();
      node.classList.add(classes.base);
      node.classList.toggle(classes.focus, this.#focused !== undefined);
      node.classList.toggle(classes.invalid, shown !== undefined);
      node.classList.toggle(classes.complete, check.complete);
      node.classList.toggle(classes.empty, check.empty);
    }
    const event: StripeCardElementChangeEvent = {
      elementType: 'card',
      empty: check.empty,
      complete: check.complete,
      error: shown ? { type: 'validation_error', code: shown.problem.code, message: shown.problem.message } : undefined,
      value: { postalCode: this.#entry.postalCode },
      brand: check.brand,
    };
    if (!valueChanged && sameEvent(this.#lastChange, event)) return;
    if (this.#lastChange === undefined && !valueChanged) {
      this.#lastChange = event;
      return;
    }
    this.#lastChange = event;
    this.#emit('change', event);
  }
}
