import { describe, expect, it } from 'vitest';
import { ConsentError, ConsentErrorCode } from './consent-error';
import { MarkdownFragment, renderTemplate, toFill } from './template-rendering';

describe('renderTemplate', () => {
  it('escapes every value for Markdown, inside lists and conditions too', () => {
    const source = '# {{title}}\n\n{{#each steps}}\n- {{name}}{{#if minutes}} ({{minutes}} min){{/if}}\n{{/each}}';
    const out = renderTemplate(source, {
      title: '*Wayfinding* <cues>',
      steps: [
        { name: '# one', minutes: 20 },
        { name: 'two_b', minutes: null },
      ],
    });
    expect(out).toBe('# \\*Wayfinding\\* \\<cues\\>\n\n- \\# one (20 min)\n- two\\_b\n');
  });

  it('refuses a placeholder the view does not provide, naming it and its line (Handlebars strict mode)', () => {
    const attempt = () => renderTemplate('Hello\n\nPaid {{totalPay}}.', { studyTitle: 'x' });
    expect(attempt).toThrow(ConsentError);
    expect(attempt).toThrow("template: uses {{totalPay}} on line 3, which the study's fields do not provide");
  });

  it('refuses a broken template with its parser message', () => {
    expect(() => renderTemplate('{{#if a}}never closed', { a: true })).toThrow(/^template: is not a valid template: /);
  });

  it('allows only the built-in helpers and no prototype access, so a template cannot reach code', () => {
    expect(() => renderTemplate('{{customHelper studyTitle}}', { studyTitle: 'x' })).toThrow(/^template: /);
    expect(renderTemplate('[{{lookup this "constructor"}}]', {})).toBe('[]');
  });

  it('checks link fields and reports every bad field at once', () => {
    try {
      renderTemplate('[a]({{portalUrl}}) [b]({{helpUrl}})', { portalUrl: 'javascript:alert(1)', helpUrl: '/relative' });
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(ConsentError);
      expect((error as ConsentError).code).toBe(ConsentErrorCode.InvalidFields);
      expect((error as ConsentError).fieldErrors).toEqual([
        { field: 'portalUrl', message: 'must be an absolute http(s) or mailto address' },
        { field: 'helpUrl', message: 'must be an absolute http(s) or mailto address' },
      ]);
    }
  });

  it('inserts Markdown fragments as they are, and shows "to fill" markers literally', () => {
    expect(renderTemplate('{{a}} {{b}}', { a: new MarkdownFragment('**bold**'), b: toFill('protocol number') })).toBe(
      '**bold** \\[to fill: protocol number\\]',
    );
  });

  it('writes plain text (for subject lines) on one line without Markdown escapes', () => {
    expect(
      renderTemplate('Your form for {{studyTitle}}', { studyTitle: 'Cues *& maps*\r\nBcc: x@y.test' }, 'plain'),
    ).toBe('Your form for Cues *& maps* Bcc: x@y.test');
  });
});
