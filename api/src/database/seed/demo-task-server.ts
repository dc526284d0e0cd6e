import { createServer, type Server } from 'node:http';

/**
 * The demo's stand-in for a lab's own survey or experiment tool, so return-link and per-participant-code steps have
 * somewhere to send people: `npm start` serves it on DEMO_TASK_PORT (3300). A task page shows the reference Evenhand
 * passed, asks two short questions (nothing is kept), shows the participant's code when one was passed, and its
 * Finish button goes to the signed return address from the `return` parameter. Plain node:http, demo only.
 */

export interface DemoTask {
  title: string;
  intro: string;
  questions: Array<{ prompt: string; options: string[] }>;
}

/** The tasks the demo studies point at; any other well-formed task path gets a general page. */
export const DEMO_TASKS: Record<string, DemoTask> = {
  'wayfinding-session-1': {
    title: 'Wayfinding, session 1: learning the building',
    intro:
      'In the real session you would walk through a virtual building for about 20 minutes. Here, two questions stand in for it.',
    questions: [
      { prompt: 'Which way did you turn at the first junction?', options: ['Left', 'Right', 'Straight on'] },
      {
        prompt: 'How sure are you of the way back to the entrance?',
        options: ['Not sure', 'Fairly sure', 'Very sure'],
      },
    ],
  },
  'wayfinding-session-2': {
    title: 'Wayfinding, session 2: finding rooms',
    intro:
      'In the real session you would find five rooms in the building you learned. Here, two questions stand in for it.',
    questions: [
      { prompt: 'Which floor was the library on?', options: ['Ground floor', 'First floor', 'Second floor'] },
      { prompt: 'How hard was it to find the rooms?', options: ['Easy', 'Manageable', 'Hard'] },
    ],
  },
  'wayfinding-session-3': {
    title: 'Wayfinding, session 3: finding rooms again',
    intro: 'In the real session you would find the rooms again, a week later. Here, two questions stand in for it.',
    questions: [
      { prompt: 'Did you remember the quickest way to the library?', options: ['Yes', 'Partly', 'No'] },
      { prompt: 'Which device did you use?', options: ['Computer', 'Tablet'] },
    ],
  },
  'checkout-shopping': {
    title: 'Checkout flows: the shopping session',
    intro: 'In the real session you would buy three items in three pretend shops. Here, two questions stand in for it.',
    questions: [
      { prompt: 'Which shop was quickest to pay in?', options: ['Shop A', 'Shop B', 'Shop C'] },
      { prompt: 'How comfortable did paying feel overall?', options: ['Uncomfortable', 'Neutral', 'Comfortable'] },
    ],
  },
};

const TASK_PATH = /^\/task\/([a-z0-9][a-z0-9-]{0,79})\/?$/;
const MAX_SHOWN = 120;

export function escapeHtml(value: string): string {
  return value.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );
}

/** The address to finish at: only an absolute http(s) address counts (never `javascript:`, `data:` or a relative path). */
export function returnAddress(value: string | null | undefined): URL | null {
  if (!value) return null;
  try {
    const url = new URL(value);
    return url.protocol === 'http:' || url.protocol === 'https:' ? url : null;
  } catch {
    return null;
  }
}

export function taskFor(slug: string): DemoTask {
  return (
    DEMO_TASKS[slug] ?? {
      title: `Task: ${slug.replace(/-/g, ' ')}`,
      intro: 'In a real study this would be the lab’s own survey or experiment. Here, two questions stand in for it.',
      questions: [
        { prompt: 'How clear were the instructions?', options: ['Unclear', 'Clear enough', 'Very clear'] },
        { prompt: 'How long did it feel?', options: ['Short', 'About right', 'Long'] },
      ],
    }
  );
}

export interface TaskPageInput {
  slug: string;
  reference: string | null;
  code: string | null;
  returnTo: string | null;
}

const STYLE = `
  body { margin: 0; font: 16px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, sans-serif; color: #1d2a2f; background: #f3f1ea; }
  main { max-width: 40rem; margin: 0 auto; padding: 1.5rem 1rem 3rem; }
  .notice { background: #fff4d6; border: 2px dashed #b38600; border-radius: .5rem; padding: .75rem 1rem; }
  .notice strong { display: block; }
  h1 { font-size: 1.5rem; margin: 1.5rem 0 .5rem; }
  h2 { font-size: 1.15rem; margin: 0 0 .5rem; }
  .card { background: #fff; border: 1px solid #d6d2c4; border-radius: .5rem; padding: 1rem; margin: 1rem 0; }
  dl { display: grid; grid-template-columns: max-content 1fr; gap: .25rem 1rem; margin: 0; }
  dt { font-weight: 600; }
  dd { margin: 0; font-family: ui-monospace, "DejaVu Sans Mono", monospace; overflow-wrap: anywhere; }
  fieldset { border: 1px solid #d6d2c4; border-radius: .5rem; margin: 0 0 1rem; padding: .5rem 1rem 1rem; }
  legend { font-weight: 600; padding: 0 .25rem; }
  label { display: block; padding: .2rem 0; }
  .code { font: 600 1.5rem/1.2 ui-monospace, "DejaVu Sans Mono", monospace; letter-spacing: .08em; }
  button { font: inherit; font-weight: 600; color: #fff; background: #1f5f5b; border: 0; border-radius: .5rem; padding: .75rem 1.25rem; cursor: pointer; }
  button:hover { background: #174744; }
  button:focus-visible { outline: 3px solid #b38600; outline-offset: 2px; }
  .problem { border-left: 4px solid #a33a2b; background: #fbeae7; padding: .75rem 1rem; border-radius: .25rem; }
  .quiet { color: #55646a; font-size: .9rem; }
`;

function shown(value: string | null): string | null {
  const trimmed = value?.trim();
  return trimmed ? trimmed.slice(0, MAX_SHOWN) : null;
}

/** The finish form: GET to the return address, its own query (if any) carried in hidden fields so nothing is lost. */
function finishForm(target: URL): string {
  const action = `${target.origin}${target.pathname}`;
  const hidden = [...target.searchParams]
    .map(([name, value]) => `<input type="hidden" name="${escapeHtml(name)}" value="${escapeHtml(value)}">`)
    .join('');
  return `<form method="get" action="${escapeHtml(action)}">${hidden}<button type="submit">Finish and go back to the study</button></form>`;
}

export function renderTaskPage(input: TaskPageInput): string {
  const task = taskFor(input.slug);
  const reference = shown(input.reference);
  const code = shown(input.code);
  const target = returnAddress(input.returnTo);
  const questions = task.questions
    .map(
      (q, i) =>
        `<fieldset><legend>${i + 1}. ${escapeHtml(q.prompt)}</legend>${q.options
          .map(
            (option) =>
              `<label><input type="radio" name="q${i + 1}" value="${escapeHtml(option)}"> ${escapeHtml(option)}</label>`,
          )
          .join('')}</fieldset>`,
    )
    .join('');
  const codeCard = code
    ? `<section class="card" aria-labelledby="code-heading"><h2 id="code-heading">Your completion code</h2>
       <p class="code">${escapeHtml(code)}</p>
       <p>If the study page asks for a code, type this one. It is yours alone.</p></section>`
    : '';
  const finish = target
    ? `${finishForm(target)}<p class="quiet">This takes you back to <span>${escapeHtml(target.host)}</span>, where the step is marked done.</p>`
    : `<div class="problem"><p><strong>This link is incomplete.</strong> ${
        input.returnTo
          ? 'The return address it carries is not a web address (http or https).'
          : 'It carries no return address.'
      } Go back to the study page and start the step again from there, so the link arrives whole.</p></div>`;
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(task.title)} · demo task stand-in</title>
<style>${STYLE}</style>
</head>
<body>
<main>
  <div class="notice" role="note">
    <strong>Demo stand-in for the lab’s own task</strong>
    In a real study this page is the lab’s own survey or experiment tool. Evenhand only sends people here and takes
    them back; it never sees what they answer.
  </div>
  <h1>${escapeHtml(task.title)}</h1>
  <p>${escapeHtml(task.intro)}</p>
  <section class="card" aria-labelledby="received-heading">
    <h2 id="received-heading">What Evenhand passed to this task</h2>
    <dl>
      <dt>Reference</dt><dd>${reference ? escapeHtml(reference) : '<em>none (the ref parameter is missing)</em>'}</dd>
    </dl>
    <p class="quiet">A lab stores answers under this pseudonymous reference, never a name or an e-mail address.</p>
  </section>
  <section aria-labelledby="task-heading">
    <h2 id="task-heading">The task</h2>
    ${questions}
    <p class="quiet">Your answers stay on this page: the stand-in keeps nothing.</p>
  </section>
  ${codeCard}
  ${finish}
</main>
</body>
</html>
`;
}

export interface DemoTaskResponse {
  status: number;
  contentType: string;
  body: string;
}

const INDEX_PAGE = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Demo task stand-in</title><style>${STYLE}</style></head>
<body><main><div class="notice" role="note"><strong>Demo stand-in for a lab’s own task</strong>Evenhand’s demo studies send participants here.</div>
<h1>Demo tasks</h1><ul>${Object.entries(DEMO_TASKS)
  .map(([slug, task]) => `<li><a href="/task/${slug}">${escapeHtml(task.title)}</a></li>`)
  .join(
    '',
  )}</ul><p class="quiet">Open a task from a study step in the participant portal: the link then carries the reference and the return address.</p></main></body></html>`;

/** Routes one request: `/health`, `/` (the list of tasks) and `/task/<name>`. */
export function answerDemoTaskRequest(method: string, rawUrl: string): DemoTaskResponse {
  const url = new URL(rawUrl, 'http://demo-task.invalid');
  if (method !== 'GET' && method !== 'HEAD')
    return { status: 405, contentType: 'text/plain; charset=utf-8', body: 'Only GET is served here.\n' };
  if (url.pathname === '/health') return { status: 200, contentType: 'application/json', body: '{"status":"ok"}' };
  if (url.pathname === '/') return { status: 200, contentType: 'text/html; charset=utf-8', body: INDEX_PAGE };
  const match = TASK_PATH.exec(url.pathname);
  if (!match) return { status: 404, contentType: 'text/plain; charset=utf-8', body: 'No such task.\n' };
  const page = renderTaskPage({
    slug: match[1],
    reference: url.searchParams.get('ref'),
    code: url.searchParams.get('code'),
    returnTo: url.searchParams.get('return'),
  });
  return { status: 200, contentType: 'text/html; charset=utf-8', body: page };
}

const SECURITY_HEADERS = {
  // Inline style only, no scripts, nothing fetched; the one form goes to the (http or https) return address.
  'Content-Security-Policy':
    "default-src 'none'; style-src 'unsafe-inline'; form-action http: https:; base-uri 'none'; frame-ancestors 'none'",
  'Referrer-Policy': 'no-referrer',
  'Cache-Control': 'no-store',
  'X-Content-Type-Options': 'nosniff',
};

export function startDemoTaskServer(port: number, host = '127.0.0.1'): Promise<Server> {
  const server = createServer((request, response) => {
    const answer = answerDemoTaskRequest(request.method ?? 'GET', request.url ?? '/');
    response.writeHead(answer.status, {
      'Content-Type': answer.contentType,
      ...SECURITY_HEADERS,
      ...(answer.status === 405 ? { Allow: 'GET, HEAD' } : {}),
    });
    response.end(request.method === 'HEAD' ? undefined : answer.body);
  });
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve(server));
  });
}

if (require.main === module) {
  const port = Number(process.env.DEMO_TASK_PORT ?? 3300);
  if (!Number.isInteger(port) || port < 0 || port > 65535)
    throw new Error(`DEMO_TASK_PORT must be a port number, not ${process.env.DEMO_TASK_PORT}`);
  startDemoTaskServer(port).then(
    (server) => {
      console.log(`Demo task stand-in on http://127.0.0.1:${port}`);
      const stop = () => {
        server.close(() => process.exit(0));
        server.closeAllConnections();
      };
      process.once('SIGTERM', stop);
      process.once('SIGINT', stop);
    },
    (error: Error) => {
      console.error(`The demo task stand-in could not listen on 127.0.0.1:${port}: ${error.message}`);
      process.exit(1);
    },
  );
}
