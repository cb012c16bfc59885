/**
 * Host-name allow-list against DNS rebinding: a web page on an attacker's name that
 * resolves to this machine's address would otherwise reach the API as same-origin (its
 * Origin and Host agree). Only the names this server is known by are answered; any other
 * Host gets 421 Misdirected Request.
 */
import { hostname, networkInterfaces } from 'node:os';
import type { NextFunction, Request, Response } from 'express';
import type { Config } from '../config.ts';
import { AppError } from './app-error.ts';

const ANY = new Set(['0.0.0.0', '::', '']);
export const LOOPBACK_NAMES = ['localhost', '127.0.0.1', '::1', '[::1]'];

export const isLoopback = (host: string) =>
  LOOPBACK_NAMES.includes(host) || /^127\.\d+\.\d+\.\d+$/.test(host);

/** Lower-case host names without port or IPv6 brackets. */
export function allowedHosts(config: Config): Set<string> {
  const names = new Set<string>(['localhost', '127.0.0.1', '::1']);
  const add = (h: string) => {
    const v = h
      .trim()
      .toLowerCase()
      .replace(/^\[|\]$/g, '');
    if (v) names.add(v);
  };
  if (config.PUBLIC_URL) add(new URL(config.PUBLIC_URL).hostname);
  for (const h of config.ALLOWED_HOSTS.split(',')) add(h);
  if (!ANY.has(config.HOST)) add(config.HOST);
  else {
    // Listening on every interface: the machine's own addresses and name are its names.
    add(hostname());
    for (const list of Object.values(networkInterfaces()))
      for (const a of list ?? []) add(a.address);
  }
  return names;
}

export function hostCheck(config: Config) {
  const names = allowedHosts(config);
  return (req: Request, _res: Response, next: NextFunction) => {
    const host = (req.hostname ?? '').toLowerCase().replace(/^\[|\]$/g, '');
    if (names.has(host)) return next();
    next(
      new AppError(
        'unknown_host',
        'This server does not answer to that host name. Use its configured address (PUBLIC_URL or ALLOWED_HOSTS).',
        421,
      ),
    );
  };
}
