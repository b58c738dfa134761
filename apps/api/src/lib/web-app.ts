import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import express, { type RequestHandler, type Router } from 'express';

/**
 * Serves the built Angular app (static files + index.html for client-side routes). index.html
 * gets the request's CSP nonce on the root element's `ngCspNonce` attribute, so Angular's runtime
 * <style> elements satisfy `style-src 'self' 'nonce-…'` without 'unsafe-inline'.
 * Returns null when the folder does not exist (API-only runs, tests, `ng serve` development).
 */
export function webAppRouter(distDir: string): Router | null {
  const root = path.resolve(process.cwd(), distDir);
  const indexPath = path.join(root, 'index.html');
  if (!existsSync(indexPath)) return null;
  const indexHtml = readFileSync(indexPath, 'utf8');

  const router = express.Router();
  router.use(express.static(root, { index: false, fallthrough: true }));
  const spaFallback: RequestHandler = (req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || req.path === '/api' || req.path.startsWith('/api/')) return next();
    // A missing asset (has a file extension) is a 404, not the app.
    if (path.extname(req.path) !== '') return next();
    res.setHeader('Cache-Control', 'no-store');
    res.type('html').send(withNonce(indexHtml, String(res.locals.cspNonce ?? '')));
  };
  router.use(spaFallback);
  return router;
}

/** Puts the nonce on the root component element (the first custom element in <body>). */
export function withNonce(html: string, nonce: string): string {
  if (!nonce) return html;
  if (/ngCspNonce="[^"]*"/.test(html)) return html.replace(/ngCspNonce="[^"]*"/, `ngCspNonce="${nonce}"`);
  const bodyAt = html.search(/<body[\s>]/i);
  if (bodyAt < 0) return html;
  const rest = html.slice(bodyAt).replace(/<([a-z][a-z0-9]*-[a-z0-9-]*)(\s|>)/i, `<$1 ngCspNonce="${nonce}"$2`);
  return html.slice(0, bodyAt) + rest;
}
