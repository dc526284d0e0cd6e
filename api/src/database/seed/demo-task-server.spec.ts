import type { AddressInfo } from 'node:net';
import { describe, expect, it } from 'vitest';
import {
  answerDemoTaskRequest,
  escapeHtml,
  renderTaskPage,
  returnAddress,
  startDemoTaskServer,
} from './demo-task-server';

const RETURN = 'http://127.0.0.1:5173/api/return/v1.abc_DEF-123.sig';

describe('returnAddress', () => {
  it.each(['http://127.0.0.1:5173/api/return/t', 'https://portal.example.org/api/return/t?x=1'])(
    'accepts the web address %s',
    (value) => {
      expect(returnAddress(value)?.toString()).toBe(value);
    },
  );

  it.each([
    ['missing', null],
    ['empty', ''],
    ['relative', '/api/return/t'],
    ['script', 'javascript:alert(1)'],
    ['data', 'data:text/html,<p>hi</p>'],
    ['file transfer', 'ftp://example.org/t'],
    ['not an address', 'return here please'],
  ])('refuses a %s return address', (_name, value) => {
    expect(returnAddress(value)).toBeNull();
  });
});

describe('escapeHtml', () => {
  it('escapes every character that could open markup or end an attribute', () => {
    expect(escapeHtml(`<a href="x" title='y'>&</a>`)).toBe(
      '&lt;a href=&quot;x&quot; title=&#39;y&#39;&gt;&amp;&lt;/a&gt;',
    );
  });
});

describe('renderTaskPage', () => {
  it('says it is a stand-in, shows the reference and sends Finish to the return address', () => {
    const page = renderTaskPage({ slug: 'wayfinding-session-1', reference: 'P-7KQ2MX', code: null, returnTo: RETURN });
    expect(page).toContain('Demo stand-in for the lab’s own task');
    expect(page).toContain('Wayfinding, session 1');
    expect(page).toContain('<dd>P-7KQ2MX</dd>');
    expect(page).toContain('<form method="get" action="http://127.0.0.1:5173/api/return/v1.abc_DEF-123.sig">');
    expect(page).toMatch(/<button type="submit">[^<]*Finish[^<]*<\/button>/);
    expect(page).not.toContain('Your completion code');
    expect(page).not.toMatch(/<script|<link|@import|url\(/);
  });

  it('escapes a reference and a code that carry markup', () => {
    const page = renderTaskPage({
      slug: 'checkout-shopping',
      reference: '<script>alert(1)</script>',
      code: '"><img src=x onerror=alert(1)>',
      returnTo: RETURN,
    });
    expect(page).not.toContain('<script>alert(1)');
    expect(page).not.toContain('<img src=x');
    expect(page).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(page).toContain('&quot;&gt;&lt;img src=x onerror=alert(1)&gt;');
  });

  it('shows the participant’s code when one was passed', () => {
    const page = renderTaskPage({
      slug: 'checkout-shopping',
      reference: 'P-ABC234',
      code: 'K7M-Q2XR',
      returnTo: RETURN,
    });
    expect(page).toContain('Your completion code');
    expect(page).toContain('<p class="code">K7M-Q2XR</p>');
  });

  it('keeps a return address’s own query in hidden fields, since a GET form replaces the query', () => {
    const page = renderTaskPage({
      slug: 'x',
      reference: 'P-1',
      code: null,
      returnTo: 'https://portal.example.org/back?study=a&b=%22q%22',
    });
    expect(page).toContain('action="https://portal.example.org/back"');
    expect(page).toContain('<input type="hidden" name="study" value="a">');
    expect(page).toContain('<input type="hidden" name="b" value="&quot;q&quot;">');
  });

  it.each([
    ['without a return address', null, 'It carries no return address.'],
    ['with a return address that is not a web address', 'javascript:alert(1)', 'is not a web address (http or https)'],
  ])('explains the link is incomplete %s, and offers no Finish button', (_name, returnTo, explanation) => {
    const page = renderTaskPage({ slug: 'wayfinding-session-2', reference: 'P-1', code: null, returnTo });
    expect(page).toContain('This link is incomplete.');
    expect(page).toContain(explanation);
    expect(page).not.toContain('<form');
    expect(page).not.toContain('javascript:');
  });

  it('says so when no reference was passed', () => {
    expect(renderTaskPage({ slug: 'x', reference: '  ', code: null, returnTo: RETURN })).toContain(
      'none (the ref parameter is missing)',
    );
  });
});

describe('answerDemoTaskRequest', () => {
  it('serves a task page with the query’s parameters, any well-formed task name, health, and nothing else', () => {
    const query = `?ref=P-7KQ2MX&token=t&return=${encodeURIComponent(RETURN)}&code=K7M-Q2XR`;
    const task = answerDemoTaskRequest('GET', `/task/checkout-shopping${query}`);
    expect(task.status).toBe(200);
    expect(task.contentType).toMatch(/^text\/html/);
    expect(task.body).toContain('<dd>P-7KQ2MX</dd>');
    expect(task.body).toContain('K7M-Q2XR');
    expect(task.body).toContain(`action="${RETURN}"`);
    expect(answerDemoTaskRequest('GET', '/task/pilot-questionnaire').body).toContain('Task: pilot questionnaire');
    expect(answerDemoTaskRequest('GET', '/health')).toMatchObject({ status: 200, body: '{"status":"ok"}' });
    expect(answerDemoTaskRequest('GET', '/task/../etc/passwd').status).toBe(404);
    expect(answerDemoTaskRequest('GET', '/task/Upper_Case').status).toBe(404);
    expect(answerDemoTaskRequest('GET', '/elsewhere').status).toBe(404);
    expect(answerDemoTaskRequest('POST', '/task/checkout-shopping').status).toBe(405);
  });
});

describe('startDemoTaskServer', () => {
  it('answers over HTTP with a policy that allows no scripts and nothing from the web', async () => {
    const server = await startDemoTaskServer(0);
    try {
      const { port } = server.address() as AddressInfo;
      const health = await fetch(`http://127.0.0.1:${port}/health`);
      expect(health.status).toBe(200);
      expect(await health.json()).toEqual({ status: 'ok' });
      const page = await fetch(
        `http://127.0.0.1:${port}/task/wayfinding-session-1?ref=P-7KQ2MX&return=${encodeURIComponent(RETURN)}`,
      );
      expect(page.status).toBe(200);
      expect(page.headers.get('content-security-policy')).toContain("default-src 'none'");
      expect(await page.text()).toContain('Finish and go back to the study');
    } finally {
      server.closeAllConnections();
      await new Promise((resolve) => server.close(resolve));
    }
  });
});
