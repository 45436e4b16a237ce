/**
 * The Content-Security-Policy of every page, carried in a <meta> so that it holds wherever the
 * site is opened: from file://, from a club's web space, or from `lineledger preview`.
 *
 * The pages need nothing but their own stylesheet: charts are inline SVG without <style>,
 * there is no script, no image file, no font, no form and no frame. So everything is refused
 * except the stylesheet (and data: images, which inline SVG may reference). `'self'` is what a
 * web server's page needs; `file:` is added because browsers give file:// pages an opaque
 * origin that `'self'` may not match (a page served over http cannot load file: URLs anyway).
 * frame-ancestors has no effect in a <meta> (CSP Level 3 says so); preview sends it as a header.
 */
export const PAGE_CSP = [
  "default-src 'none'",
  "style-src 'self' file:",
  "img-src 'self' data: file:",
  "base-uri 'none'",
  "form-action 'none'",
].join('; ');

/**
 * What `lineledger preview` allows on top: its reload script (served from its own origin, never
 * inline) and the event stream that script listens to. The widened policy replaces the page's
 * <meta>; the header adds frame-ancestors, which a <meta> cannot carry.
 */
export const PREVIEW_CSP = `${PAGE_CSP}; script-src 'self'; connect-src 'self'`;
export const PREVIEW_CSP_HEADER = `${PREVIEW_CSP}; frame-ancestors 'none'`;

/** The <meta> element as the layout writes it (the preview server looks for exactly this). */
export function cspMeta(policy: string): string {
  return `<meta http-equiv="Content-Security-Policy" content="${policy}">`;
}
