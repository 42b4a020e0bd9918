import helmet from 'helmet';
import type { RequestHandler } from 'express';

/**
 * helmet with a CSP for a self-contained app: scripts, styles, fonts and WebSocket from our own
 * origin only (CSP level 3 'self' covers ws: to the same host), no CDN. Inline styles stay allowed
 * because chart and layout libraries set style attributes. HTTPS-only headers only when served
 * over HTTPS, or a plain-HTTP loopback install would break itself.
 */
export function securityHeaders(secure: boolean): RequestHandler {
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        baseUri: ["'self'"],
        scriptSrc: ["'self'"],
        scriptSrcAttr: ["'none'"],
        styleSrc: ["'self'", "'unsafe-inline'"],
        fontSrc: ["'self'", 'data:'],
        imgSrc: ["'self'", 'data:', 'blob:'],
        connectSrc: ["'self'"],
        workerSrc: ["'self'", 'blob:'],
        objectSrc: ["'none'"],
        frameAncestors: ["'none'"],
        formAction: ["'self'"],
        ...(secure ? { upgradeInsecureRequests: [] } : {}),
      },
    },
    strictTransportSecurity: secure,
  });
}
