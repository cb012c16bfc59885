/**
 * The web build's assets as the build compressed them (`.br`, `.gz` beside each file, made
 * once at build time at the strongest levels): a cold page load costs the server no
 * compression work, which on a busy machine was most of the time its scripts took to arrive.
 * Files without a compressed copy, or browsers that accept neither, fall through to the
 * plain static files (and the compression middleware).
 */
import { existsSync } from 'node:fs';
import { extname, join } from 'node:path';
import type { RequestHandler } from 'express';

const ASSET = /^\/[\w.-]+\.(js|css|svg)$/;

export function precompressedAssets(dir: string): RequestHandler {
  return (req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || !ASSET.test(req.path)) return next();
    res.vary('Accept-Encoding');
    const encoding = req.acceptsEncodings('br', 'gzip', 'identity');
    const suffix = encoding === 'br' ? '.br' : encoding === 'gzip' ? '.gz' : null;
    const file = suffix && join(dir, req.path.slice(1) + suffix);
    if (!file || !existsSync(file)) return next();
    res.setHeader('Content-Encoding', encoding as string);
    res.type(extname(req.path));
    res.sendFile(file, { immutable: true, maxAge: '365d' }, (err) => {
      // A browser that no longer wants the file (a page left, a prefetch cancelled) closes
      // the connection: nobody is left to answer and nothing went wrong on our side.
      if (!err || (err as { code?: string }).code === 'ECONNABORTED') return;
      if (!res.headersSent) next(err);
    });
  };
}
