/**
 * helmet with a content security policy the Angular build satisfies:
 * scripts and styles from our own origin; the build's few inline snippets
 * (the critical-CSS loader's `onload` handler, any inline script) are allowed
 * by their SHA-256 hashes, read from the built index.html at start. Component
 * styles are inserted at runtime as <style> elements, hence style-src
 * 'unsafe-inline' (styles cannot run code).
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { RequestHandler } from 'express';
import helmet from 'helmet';

const sha256 = (s: string) => `'sha256-${createHash('sha256').update(s, 'utf8').digest('base64')}'`;

/** Hashes of inline scripts and inline event handlers in a built index.html. */
export function inlineScriptHashes(html: string): { scripts: string[]; handlers: string[] } {
  const scripts = [...html.matchAll(/<script\b(?![^>]*\bsrc=)[^>]*>([\s\S]*?)<\/script>/gi)]
    .map((m) => m[1] ?? '')
    .filter((body) => body.trim() !== '')
    .map(sha256);
  const handlers = [...html.matchAll(/\son[a-z]+=(?:"([^"]*)"|'([^']*)')/gi)].map((m) => sha256(m[1] ?? m[2] ?? ''));
  return { scripts: [...new Set(scripts)], handlers: [...new Set(handlers)] };
}

export function securityHeaders(staticDir: string, production: boolean): RequestHandler {
  const index = join(staticDir, 'index.html');
  const { scripts, handlers } = existsSync(index) ? inlineScriptHashes(readFileSync(index, 'utf8')) : { scripts: [], handlers: [] };
  const scriptSrc = ["'self'", ...scripts, ...(handlers.length ? ["'unsafe-hashes'", ...handlers] : [])];
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        baseUri: ["'self'"],
        scriptSrc,
        scriptSrcAttr: handlers.length ? ["'unsafe-hashes'", ...handlers] : ["'none'"],
        styleSrc: ["'self'", "'unsafe-inline'"],
        fontSrc: ["'self'", 'data:'],
        imgSrc: ["'self'", 'data:', 'blob:'],
        connectSrc: ["'self'"],
        workerSrc: ["'self'", 'blob:'],
        objectSrc: ["'none'"],
        frameAncestors: ["'none'"],
        formAction: ["'self'"],
        // Only behind real TLS: on http://127.0.0.1 it would send the browser to https.
        ...(production ? { upgradeInsecureRequests: [] } : {}),
      },
    },
    strictTransportSecurity: production ? { maxAge: 15_552_000, includeSubDomains: true } : false,
    crossOriginEmbedderPolicy: false,
  });
}
