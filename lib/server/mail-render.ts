/** Plain, readable e-mail bodies: the same words as text and as simple HTML. */
export interface MailContent {
  greeting: string;
  paragraphs: string[];
  action?: { label: string; url: string };
  /** Quoted text from a person, e.g. a reviewer's comment. */
  quote?: { by: string; text: string };
}

const FOOTER = "This message was sent by Airtally, the airflow commissioning record for your project. Replies to it are not read.";

function escapeHtml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");
}

export function renderMail(content: MailContent): { text: string; html: string } {
  const text = [
    content.greeting,
    "",
    ...content.paragraphs.flatMap((p) => [p, ""]),
    ...(content.quote ? [`${content.quote.by} wrote:`, ...content.quote.text.split("\n").map((l) => `> ${l}`), ""] : []),
    ...(content.action ? [`${content.action.label}:`, content.action.url, ""] : []),
    "—",
    FOOTER,
  ].join("\n");
  const html = [
    `<div style="font-family:sans-serif;font-size:16px;line-height:1.5;color:#111a22;max-width:36em">`,
    `<p>${escapeHtml(content.greeting)}</p>`,
    ...content.paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`),
    ...(content.quote
      ? [`<p>${escapeHtml(content.quote.by)} wrote:</p><blockquote style="border-left:3px solid #8a958c;margin:0;padding-left:1em">${escapeHtml(content.quote.text).replace(/\n/g, "<br>")}</blockquote>`]
      : []),
    ...(content.action ? [`<p><a href="${escapeHtml(content.action.url)}">${escapeHtml(content.action.label)}</a></p>`] : []),
    `<p style="color:#52606d;font-size:14px">${escapeHtml(FOOTER)}</p>`,
    `</div>`,
  ].join("\n");
  return { text, html };
}
