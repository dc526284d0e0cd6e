import { describe, expect, it } from 'vitest';
import { checkOnboardingForm, escapeHtml, renderOnboardingPage } from './onboarding-page';

describe('escapeHtml', () => {
  // Outside reference: OWASP Cross Site Scripting Prevention Cheat Sheet, output encoding for
  // HTML contexts — & < > " ' become &amp; &lt; &gt; &quot; &#x27; (or &#39;).
  it('encodes the five characters OWASP lists for HTML contexts', () => {
    expect(escapeHtml(`&<>"'`)).toBe('&amp;&lt;&gt;&quot;&#39;');
    expect(escapeHtml('plain text')).toBe('plain text');
  });
});

describe('checkOnboardingForm', () => {
  it('accepts a name and a ticked confirmation', () => {
    expect(checkOnboardingForm({ fullName: 'Avery Quill', confirmed: true })).toEqual({});
  });

  it('names each missing field', () => {
    expect(checkOnboardingForm({ fullName: '   ', confirmed: false })).toEqual({
      fullName: 'Name on your bank account: write your name.',
      confirmed: 'Confirmation: tick the box to say these details are right.',
    });
    expect(checkOnboardingForm({ fullName: 'x'.repeat(101), confirmed: true }).fullName).toMatch(/100 characters/);
  });
});

describe('renderOnboardingPage', () => {
  const input = {
    actionPath: '/onboarding/sessions/abc',
    platformName: 'Evenhand',
    email: 'p001@evenhand.test',
    country: 'US',
    currency: 'usd',
    form: { fullName: '', confirmed: false },
    errors: {},
  };

  it('labels every input and posts to the session', () => {
    const html = renderOnboardingPage(input);
    expect(html).toContain('<html lang="en">');
    expect(html).toContain('action="/onboarding/sessions/abc"');
    expect(html).toContain('<label for="full_name">');
    expect(html).toContain('id="full_name"');
    expect(html).toContain('for="confirmed"');
    expect(html).toContain('USD');
    expect(html).not.toContain('role="alert"');
  });

  it('shows errors in an alert and marks the fields invalid', () => {
    const html = renderOnboardingPage({
      ...input,
      errors: { fullName: 'Name on your bank account: write your name.' },
    });
    expect(html).toContain('role="alert"');
    expect(html).toContain('aria-invalid="true"');
    expect(html).toContain('aria-describedby="full_name_hint full_name_error"');
  });

  it('escapes the values it echoes back', () => {
    const html = renderOnboardingPage({ ...input, form: { fullName: '"><script>x</script>', confirmed: false } });
    expect(html).not.toContain('<script>x</script>');
  });
});
