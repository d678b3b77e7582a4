/**
 * The small Markdown subset of comments, rendered to HTML that is safe to insert into a page.
 *
 * Two layers: `marked` parses the Markdown with raw HTML turned into visible text (no raw HTML at
 * all), images shown as their alt text and headings as bold paragraphs; then `sanitize-html`
 * keeps only an allow-list of tags and attributes (no event handlers, no style, links only to
 * http, https and mailto) and gives every link rel="noopener nofollow". The sanitiser runs on
 * the parser's output, so a bug in the first layer cannot reach the page.
 */
import { Marked, type Tokens, type TokenizerAndRendererExtension } from "marked";
import sanitizeHtml from "sanitize-html";
import { MAX_COMMENT_LENGTH, MAX_NESTING, nestingDepth, nestingProblem } from "@/shared/schemas/comments";

// The rules a body must meet to be stored live with the comment schemas; re-exported for callers here.
export { MAX_COMMENT_LENGTH, MAX_NESTING, nestingDepth, nestingProblem };

const escapeHtml = (s: string): string =>
  s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");

/** `@handle`: the part of a member's email before the @, lower-cased. */
const MENTION_RE = /@([a-z0-9](?:[a-z0-9._-]{0,62}[a-z0-9])?)/gi;

/** The mention handle of an email address. */
export const handleOf = (email: string): string => email.split("@")[0].toLowerCase();

/** Distinct handles mentioned in a Markdown body (outside code is not distinguished: harmless). */
export function mentionedHandles(body: string): string[] {
  const out = new Set<string>();
  for (const m of body.matchAll(MENTION_RE)) {
    const before = m.index === 0 ? "" : body[m.index - 1];
    if (before === "" || /[\s([{"'>*_~]/.test(before)) out.add(m[1].toLowerCase());
  }
  return [...out];
}

interface RenderOptions {
  /** Handles of team members: `@handle` of one of them is marked as a mention. */
  mentions?: ReadonlySet<string>;
}

function mentionExtension(known: ReadonlySet<string>): TokenizerAndRendererExtension {
  return {
    name: "mention",
    level: "inline",
    start(src: string) {
      const i = src.search(/(^|[\s([{])@[a-z0-9]/i);
      return i < 0 ? undefined : src[i] === "@" ? i : i + 1;
    },
    tokenizer(src: string) {
      const m = /^@([a-z0-9](?:[a-z0-9._-]{0,62}[a-z0-9])?)/i.exec(src);
      if (!m || !known.has(m[1].toLowerCase())) return undefined;
      return { type: "mention", raw: m[0], handle: m[1].toLowerCase() };
    },
    renderer(token) {
      return `<span class="mention">@${escapeHtml(String(token.handle))}</span>`;
    },
  };
}

function parser(known: ReadonlySet<string>): Marked {
  const md = new Marked({ gfm: true, breaks: true, async: false });
  md.use({
    extensions: [mentionExtension(known)],
    renderer: {
      html(token: Tokens.HTML | Tokens.Tag) {
        return escapeHtml(token.text);
      },
      image(token: Tokens.Image) {
        return escapeHtml(token.text || token.href);
      },
      heading(token: Tokens.Heading) {
        return `<p><strong>${this.parser.parseInline(token.tokens)}</strong></p>\n`;
      },
    },
  });
  return md;
}

const EMPTY = new Set<string>();
const defaultParser = parser(EMPTY);

const SANITIZE_OPTIONS: sanitizeHtml.IOptions = {
  allowedTags: ["p", "br", "strong", "em", "del", "code", "pre", "blockquote", "ul", "ol", "li", "a", "span", "hr", "table", "thead", "tbody", "tr", "th", "td"],
  allowedAttributes: { a: ["href", "title", "rel"], span: ["class"], ol: ["start"], th: ["align"], td: ["align"] },
  allowedClasses: { span: ["mention"] },
  allowedSchemes: ["http", "https", "mailto"],
  allowedSchemesAppliedToAttributes: ["href"],
  allowProtocolRelative: false,
  disallowedTagsMode: "escape",
  transformTags: {
    a: (tagName, attribs) => ({ tagName, attribs: { ...attribs, rel: "noopener nofollow" } }),
  },
  // Text of dropped script/style-like elements is dropped with them.
  nonTextTags: ["script", "style", "textarea", "option", "noscript", "title", "xmp", "iframe", "noembed", "noframes"],
};

/** Source shown as text: escaped, one paragraph, line breaks kept. */
const plainText = (source: string): string => `<p>${escapeHtml(source).replace(/\r\n|\r|\n/g, "<br />")}</p>\n`;

/**
 * Markdown → sanitised HTML. A source nested deeper than MAX_NESTING (stored before the limit
 * existed) is shown as plain text instead of being parsed.
 */
export function renderMarkdown(source: string, opts: RenderOptions = {}): string {
  const text = source.slice(0, MAX_COMMENT_LENGTH);
  if (nestingDepth(text) > MAX_NESTING) return sanitizeHtml(plainText(text), SANITIZE_OPTIONS);
  const md = opts.mentions && opts.mentions.size > 0 ? parser(opts.mentions) : defaultParser;
  const raw = md.parse(text) as string;
  return sanitizeHtml(raw, SANITIZE_OPTIONS);
}

/** What a reader sees instead of a comment whose body could not be rendered. */
export const UNRENDERABLE = "this comment could not be displayed";

/**
 * Renders one comment on its own: a body the renderer fails on gives `html: ""` and the reason,
 * so one bad comment never breaks the list it is in. `render` is the renderer (renderMarkdown).
 */
export function renderComment(
  source: string,
  opts: RenderOptions = {},
  render: (source: string, opts: RenderOptions) => string = renderMarkdown,
): { html: string; renderError: string | null } {
  try {
    return { html: render(source, opts), renderError: null };
  } catch (err) {
    console.error("[markdown] a comment could not be rendered:", err instanceof Error ? err.message.split("\n")[0] : err);
    return { html: "", renderError: UNRENDERABLE };
  }
}

