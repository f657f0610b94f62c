/**
 * Markdown notes → HTML with raw HTML disabled (markdown-it `html: false`), so
 * text typed into a record can never inject markup or script. Links are
 * limited to relative targets, http(s), mailto and inline data: pictures by
 * the allow-list of safeUrl.ts, in place of markdown-it's own validateLink (a
 * deny-list of javascript:, vbscript:, file: and data:); a link with any
 * other scheme stays plain text. The same allow-list checks drawn pages read
 * back from the cache (src/publish/drawnPageCheck.ts).
 *
 * Images are never fetched: `![label](https://…/x.png)` renders as a link to
 * the picture, labelled with its alt text, so a page makes no request to
 * another site (which its Content-Security-Policy would block, with a console
 * error) and a relative picture path (the raw files are published by content
 * hash, not by path) never gives a broken image. Only an inline data: image,
 * which needs no request, is shown as a picture.
 */
import MarkdownIt from "markdown-it";
import { isAllowedUrl } from "./safeUrl.ts";

const md = new MarkdownIt({ html: false, linkify: false, typographer: false });
md.validateLink = isAllowedUrl;

const inlineImage = md.renderer.rules.image!;
md.renderer.rules.image = (tokens, idx, options, env, self) => {
  const token = tokens[idx];
  const src = String(token.attrGet("src") ?? "");
  if (/^data:image\//i.test(src)) return inlineImage(tokens, idx, options, env, self);
  const label = self.renderInlineAsText(token.children ?? [], options, env) || src;
  const title = token.attrGet("title") == null ? "" : String(token.attrGet("title"));
  const esc = md.utils.escapeHtml;
  return `<a class="note-image" href="${esc(src)}"${title ? ` title="${esc(title)}"` : ""}>${esc(`[picture: ${label}]`)}</a>`;
};

// Table alignment as a class, not markdown-it's style="text-align:…", which the pages' Content-Security-Policy
// (style-src 'self') would refuse with a console error; site.css aligns .align-left/-center/-right.
for (const rule of ["th_open", "td_open"] as const) {
  md.renderer.rules[rule] = (tokens, idx, options, _env, self) => {
    const token = tokens[idx];
    const align = /^text-align:(left|right|center)$/.exec(String(token.attrGet("style") ?? ""))?.[1];
    if (align) {
      token.attrs = (token.attrs ?? []).filter(([name]) => name !== "style");
      token.attrJoin("class", `align-${align}`);
    }
    return self.renderToken(tokens, idx, options);
  };
}

export function renderNotes(text: string): string {
  return md.render(text ?? "");
}
