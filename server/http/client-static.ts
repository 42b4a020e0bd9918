import { existsSync } from 'node:fs';
import { join } from 'node:path';
import express, { type Express, type RequestHandler } from 'express';

/** The alarm service worker's file at the site's root (vite.config.ts names it). */
const SERVICE_WORKER_FILE = '/alarm-sw.js';

const NOT_BUILT_PAGE =
  '<!doctype html><meta charset="utf-8"><title>Kneepoint</title>' +
  '<p>The client is not built yet: run <code>npm run build:client</code> (npm start does it for you).</p>';

/**
 * Serves the built client with an SPA fallback (any non-API GET that wants HTML gets
 * index.html). Source maps hold the whole client source, so they pass `guardSourceMaps`
 * (sign-in) first and are never cached by shared caches.
 */
export function serveClient(app: Express, clientDir: string, guardSourceMaps: RequestHandler[]): void {
  const indexFile = join(clientDir, 'index.html');
  const built = existsSync(indexFile);
  const maps = express.Router();
  maps.use(...guardSourceMaps, (_req, res, next) => {
    res.setHeader('Cache-Control', 'private, no-store');
    next();
  });
  app.use((req, res, next) => (req.path.endsWith('.map') ? maps(req, res, next) : next()));
  if (built) {
    app.use(express.static(clientDir, {
      index: false, maxAge: '1h',
      // The alarm service worker is looked up by its fixed URL: revalidate it, so a new build reaches browsers at once.
      setHeaders: (res, path) => {
        if (path.endsWith(SERVICE_WORKER_FILE)) res.setHeader('Cache-Control', 'no-cache');
      },
    }));
  }
  app.use((req, res, next) => {
    const wantsPage = (req.method === 'GET' || req.method === 'HEAD') && !req.path.startsWith('/api/') && !req.path.startsWith('/ws');
    if (!wantsPage || !req.accepts('html')) return next();
    res.setHeader('Cache-Control', 'no-cache');
    if (built) return res.sendFile(indexFile);
    res.type('html').send(NOT_BUILT_PAGE);
  });
}
