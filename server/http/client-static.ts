import { existsSync } from 'node:fs';
import { join } from 'node:path';
import express, { type Express } from 'express';

const NOT_BUILT_PAGE =
  '<!doctype html><meta charset="utf-8"><title>Kneepoint</title>' +
  '<p>The client is not built yet: run <code>npm run build:client</code> (npm start does it for you).</p>';

/** Serves the built client with an SPA fallback (any non-API GET that wants HTML gets index.html). */
export function serveClient(app: Express, clientDir: string): void {
  const indexFile = join(clientDir, 'index.html');
  const built = existsSync(indexFile);
  if (built) app.use(express.static(clientDir, { index: false, maxAge: '1h' }));
  app.use((req, res, next) => {
    const wantsPage = (req.method === 'GET' || req.method === 'HEAD') && !req.path.startsWith('/api/') && !req.path.startsWith('/ws');
    if (!wantsPage || !req.accepts('html')) return next();
    res.setHeader('Cache-Control', 'no-cache');
    if (built) return res.sendFile(indexFile);
    res.type('html').send(NOT_BUILT_PAGE);
  });
}
