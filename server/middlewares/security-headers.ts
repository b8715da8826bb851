import helmet from "helmet";
import type { RequestHandler } from "express";

/**
 * The content security policy of every response (API and client). The built client satisfies it: Vite emits only
 * external module scripts and stylesheets (no inline <script> or <style>), small assets inlined as data: URLs, fonts
 * from /assets; the charts draw on canvas. The one relaxation is `style-src-attr 'unsafe-inline'`: the charts'
 * tooltips are HTML strings with style="" attributes, which a strict style-src refuses (seen in Chromium:
 * tests/e2e/csp.test.ts hovers a chart). It allows style attributes only — never <style> elements or any script.
 */
export const CONTENT_SECURITY_POLICY: Readonly<Record<string, readonly string[]>> = {
  "default-src": ["'self'"],
  "script-src": ["'self'"],
  "script-src-attr": ["'none'"],
  "style-src": ["'self'"],
  "style-src-attr": ["'unsafe-inline'"],
  "img-src": ["'self'", "data:"],
  "font-src": ["'self'", "data:"],
  "connect-src": ["'self'"],
  "frame-src": ["'none'"],
  "frame-ancestors": ["'none'"],
  "object-src": ["'none'"],
  "base-uri": ["'self'"],
  "form-action": ["'self'"],
};

/** HSTS in production: one year, with subdomains (browsers ignore it over plain http, so it is pointless on loopback). */
const HSTS_MAX_AGE_SECONDS = 365 * 24 * 3600;

/**
 * helmet with Lotwise's settings. `production` adds HSTS and upgrade-insecure-requests (both would break plain-http
 * loopback in development). Referrer-Policy is `same-origin`, not helmet's `no-referrer`: under `no-referrer` a
 * browser sends `Origin: null` on same-origin POSTs (Fetch standard, "append a request Origin header"), which the
 * CSRF check in middlewares/origin.ts must refuse.
 */
export function securityHeaders(options: { production: boolean }): RequestHandler {
  const directives: Record<string, string[]> = Object.fromEntries(Object.entries(CONTENT_SECURITY_POLICY).map(([k, v]) => [k, [...v]]));
  if (options.production) directives["upgrade-insecure-requests"] = [];
  return helmet({
    contentSecurityPolicy: { useDefaults: false, directives },
    crossOriginEmbedderPolicy: false,
    crossOriginOpenerPolicy: { policy: "same-origin" },
    crossOriginResourcePolicy: { policy: "same-origin" },
    referrerPolicy: { policy: "same-origin" },
    strictTransportSecurity: options.production ? { maxAge: HSTS_MAX_AGE_SECONDS, includeSubDomains: true } : false,
    xFrameOptions: { action: "deny" },
    xPoweredBy: true,
  }) as RequestHandler;
}
