/**
 * Headers on every response of the local web host. The page may load and call only its own
 * origin: no other host is named anywhere in the policy, so a stray request to another origin is
 * blocked by the browser and reported as a console error (which the end-to-end tests collect).
 * Styles allow inline values because React and ECharts set element styles at run time; scripts
 * never run inline. 'wasm-unsafe-eval' lets the recompute workers compile the dense kernels'
 * WebAssembly module (shared-core/linalg/wasm/, bytes in the app's own script) and nothing else:
 * eval and new Function stay refused.
 */
export const CONTENT_SECURITY_POLICY = [
  "default-src 'none'",
  "script-src 'self' 'wasm-unsafe-eval'",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "worker-src 'self' blob:",
  "manifest-src 'self'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
  "object-src 'none'",
].join('; ');

export function securityHeaders(): Record<string, string> {
  return {
    'Content-Security-Policy': CONTENT_SECURITY_POLICY,
    'X-Content-Type-Options': 'nosniff',
    'Referrer-Policy': 'no-referrer',
    'X-Frame-Options': 'DENY',
    'Cross-Origin-Opener-Policy': 'same-origin',
    'Cross-Origin-Resource-Policy': 'same-origin',
    'Permissions-Policy': 'camera=(), microphone=(), geolocation=(), usb=(), serial=(), bluetooth=()',
  };
}
