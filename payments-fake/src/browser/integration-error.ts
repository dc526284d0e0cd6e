/** A mistake in how the page uses the browser API, thrown at once as the provider's library does. */
export class IntegrationError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'IntegrationError';
  }
}
