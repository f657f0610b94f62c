/**
 * Markdown notes → HTML with raw HTML disabled (markdown-it `html: false`), so
 * text typed into a record can never inject markup or script. Links are
 * limited to http(s), mailto and relative targets by markdown-it's own
 * validateLink (javascript:, vbscript:, file: and data: are refused).
 */
import MarkdownIt from "markdown-it";

const md = new MarkdownIt({ html: false, linkify: false, typographer: false });

export function renderNotes(text: string): string {
  return md.render(text ?? "");
}
