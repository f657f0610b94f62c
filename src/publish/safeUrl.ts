/**
 * The links a page may carry in markup that waferbook prepared (Markdown
 * notes, SVG figures) and in the page model's link fields: a path relative
 * to the page or the site (no scheme), or one of the schemes ALLOWED, or an
 * inline picture (data:image/png|gif|jpeg|webp). An allow-list, applied on
 * both sides: the Markdown renderer (markdown.ts) writes no other link, and a
 * drawn page read back from the cache (drawnPageCheck.ts) holding any other
 * is refused. So javascript:, vbscript:, file:, data:text/html and schemes
 * nobody thought of never reach a page.
 *
 * Browsers decode character references in attribute values and drop tabs,
 * new lines and leading control characters from URLs before reading the
 * scheme ("java&#9;script:", "&#106;avascript:", "javascript&colon;"), so the
 * check decodes numeric references and the five XML ones, refuses any other
 * named reference, and removes those characters before looking.
 */
const ALLOWED = new Set(["http", "https", "mailto"]);
const DATA_IMAGE = /^data:image\/(gif|png|jpeg|webp);/i;
const NAMED: Record<string, string> = { amp: "&", lt: "<", gt: ">", quot: '"', apos: "'" };

/** `url` as a browser reads it (character references decoded, tabs, new lines and leading controls dropped), and the first named reference it does not know. */
function asRead(url: string): { bare: string; unknownEntity?: string } {
  let unknownEntity: string | undefined;
  const decoded = url
    .replace(/&#(x[0-9a-f]+|[0-9]+);?/gi, (_, n: string) => {
      const code = n[0] === "x" || n[0] === "X" ? parseInt(n.slice(1), 16) : Number(n);
      return code > 0 && code <= 0x10ffff ? String.fromCodePoint(code) : "\uFFFD";
    })
    .replace(/&([a-z][a-z0-9]*);?/gi, (whole, name: string) => {
      if (name.toLowerCase() in NAMED && whole.endsWith(";")) return NAMED[name.toLowerCase()];
      unknownEntity ??= whole;
      return whole;
    });
  // What a browser ignores when it reads a URL: ASCII tab and new lines anywhere, C0 controls and spaces at the ends.
  // biome-ignore lint/suspicious/noControlCharactersInRegex: the control characters are what this strips
  return { bare: decoded.replace(/[\t\n\r]/g, "").replace(/^[\u0000-\u0020]+/, ""), unknownEntity };
}

/** Why `url` (as written in an attribute, character references and all) is not a link waferbook writes; undefined when it is. */
export function urlProblem(url: string): string | undefined {
  const { bare, unknownEntity } = asRead(url);
  if (unknownEntity) return `the link ${JSON.stringify(url)} holds the character reference ${unknownEntity}, which waferbook never writes in a link`;
  if (DATA_IMAGE.test(bare)) return undefined;
  const scheme = /^([^/?#]*?):/.exec(bare)?.[1];
  if (scheme === undefined) return undefined;
  if (/^[a-z][a-z0-9+.-]*$/i.test(scheme) && ALLOWED.has(scheme.toLowerCase())) return undefined;
  return `the link ${JSON.stringify(url)} uses the scheme "${scheme}:" (allowed: none, ${[...ALLOWED].map((s) => `${s}:`).join(", ")} and data:image/…)`;
}

/**
 * Why `url` is not a link within the site, as waferbook's drawing writes in
 * the page model's link fields and chart links (raw copies, pictures, other
 * wafers' pages): urlProblem, and then no scheme at all and no "//" (or
 * "\\", which browsers read alike) at its start, which would lead to
 * another host. Undefined when it is.
 */
export function relativeLinkProblem(url: string): string | undefined {
  const why = urlProblem(url);
  if (why) return why;
  const { bare } = asRead(url);
  if (/^([^/?#]*?):/.test(bare) || /^[/\\]{2}/.test(bare))
    return `the link ${JSON.stringify(url)} leads off the site (waferbook draws only relative links there)`;
  return undefined;
}

/** Whether waferbook writes `url` as a link (for markdown-it's validateLink). */
export function isAllowedUrl(url: string): boolean {
  return urlProblem(url) === undefined;
}
