import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';

/**
 * Serves the built web app from `distDir` and answers every other GET outside /api with its
 * index.html (the app's router takes over). /api paths never fall through to the app: their 404s stay
 * JSON. Returns false when there is no build to serve.
 */
export function serveWebApp(app: Express, distDir: string): boolean {
  const indexHtml = path.join(distDir, 'index.html');
  if (!existsSync(indexHtml)) return false;
  app.use(express.static(distDir, { index: false, maxAge: '1h' }));
  app.get(/^(?!\/api(?:\/|$)).*/, (_req, res) => {
    res.set('Cache-Control', 'no-cache').sendFile(indexHtml);
  });
  return true;
}
