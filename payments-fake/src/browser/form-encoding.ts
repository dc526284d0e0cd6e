// The provider's request encoding from the browser side: form pairs with bracket keys for nested
// hashes (`payment_method_data[card][number]=…`), as the official SDKs send them
// (https://docs.stripe.com/api, "Request encoding"). Pure: no DOM, no framework imports.

export type FormInput = string | number | boolean | null | undefined | FormInput[] | { [key: string]: FormInput };

function pairs(prefix: string, value: FormInput, out: string[]): void {
  if (value === undefined || value === null) return;
  if (Array.isArray(value)) {
    value.forEach((entry, index) => pairs(`${prefix}[${index}]`, entry, out));
    return;
  }
  if (typeof value === 'object') {
    for (const [key, entry] of Object.entries(value)) pairs(prefix === '' ? key : `${prefix}[${key}]`, entry, out);
    return;
  }
  out.push(`${encodeURIComponent(prefix)}=${encodeURIComponent(String(value))}`);
}

/** `{a: {b: 1}, c: ['x']}` → `a%5Bb%5D=1&c%5B0%5D=x`; undefined and null values are left out. */
export function encodeForm(params: { [key: string]: FormInput }): string {
  const out: string[] = [];
  pairs('', params, out);
  return out.join('&');
}
