// `stripe.elements()` of the stand-in: a group that creates the one element we use, `card`
// (https://docs.stripe.com/js/elements_object/create). Web fonts named in the options are not
// fetched: the stand-in loads nothing from the web, and the host page's own font is inherited.

import type { Appearance, StripeCardElementOptions } from '@stripe/stripe-js';
import { CardElementStandIn } from './card-element.browser';
import { IntegrationError } from './integration-error';

export interface ElementsGroupOptions {
  appearance?: Appearance;
  [option: string]: unknown;
}

export class ElementsGroupStandIn {
  #appearance: Appearance | undefined;
  #card: CardElementStandIn | undefined;

  constructor(options: ElementsGroupOptions | undefined) {
    this.#appearance = options?.appearance;
  }

  create(elementType: string, options?: StripeCardElementOptions): CardElementStandIn {
    if (elementType !== 'card') {
      throw new IntegrationError(
        `The payments stand-in offers only the 'card' element; '${elementType}' is not available.`,
      );
    }
    if (this.#card)
      throw new IntegrationError(
        "This elements() group already has a card element. Use getElement('card') or destroy() it first.",
      );
    const card = new CardElementStandIn(options, this.#appearance, () => {
      if (this.#card === card) this.#card = undefined;
    });
    this.#card = card;
    return card;
  }

  getElement(elementType: string): CardElementStandIn | null {
    return elementType === 'card' ? (this.#card ?? null) : null;
  }

  update(options: ElementsGroupOptions): void {
    if (!('appearance' in options)) return;
    this.#appearance = options.appearance;
    if (this.#card) CardElementStandIn.setAppearance(this.#card, this.#appearance);
  }
}
