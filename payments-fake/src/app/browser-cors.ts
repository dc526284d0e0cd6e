// CORS for what a browser page on another loopback port calls: the REST API under /v1 and the
// browser script. The grant names the caller's own origin (never `*`), so other sites get none and
// the browser keeps them out (Fetch standard, CORS protocol: https://fetch.spec.whatwg.org/#http-cors-protocol).

import type { NextFunction, Request, Response } from 'express';
import { isLoopbackOrigin } from './loopback-origin';

export interface BrowserCorsOptions {
  methods: string;
  allowHeaders: string;
  exposeHeaders?: string;
}

export function browserCors(options: BrowserCorsOptions) {
  return (req: Request, res: Response, next: NextFunction): void => {
    const origin = req.get('origin');
    const allowed = isLoopbackOrigin(origin);
    res.vary('Origin');
    if (allowed) {
      res.set('Access-Control-Allow-Origin', origin);
      if (options.exposeHeaders) res.set('Access-Control-Expose-Headers', options.exposeHeaders);
    }
    if (req.method !== 'OPTIONS') {
      next();
      return;
    }
    if (allowed) {
      res.set('Access-Control-Allow-Methods', options.methods);
      res.set('Access-Control-Allow-Headers', options.allowHeaders);
      res.set('Access-Control-Max-Age', '600');
    }
    res.status(204).end();
  };
}
