// Security headers on every answer, app and API alike: a content security policy the built client
// keeps to (its own scripts, styles, fonts and images only), no framing by any page (so the signing
// page cannot be overlaid), no MIME sniffing. HSTS only where Phaselot is served over HTTPS.
import helmet from 'helmet';
import { config } from '../config';

const https = config.PUBLIC_URL.startsWith('https:');

export const securityHeaders = helmet({
  contentSecurityPolicy: {
    useDefaults: false,
    directives: {
      defaultSrc: ["'self'"],
      scriptSrc: ["'self'"],
      styleSrc: ["'self'"],
      imgSrc: ["'self'", 'data:'],
      fontSrc: ["'self'"],
      connectSrc: ["'self'"],
      objectSrc: ["'none'"],
      baseUri: ["'self'"],
      formAction: ["'self'"],
      frameAncestors: ["'none'"],
      ...(https ? { upgradeInsecureRequests: [] } : {}),
    },
  },
  xFrameOptions: { action: 'deny' },
  strictTransportSecurity: https ? { maxAge: 180 * 24 * 3600 } : false,
});
