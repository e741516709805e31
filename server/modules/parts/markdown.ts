// Contributors write Markdown; the server renders it once and keeps only safe HTML.
import MarkdownIt from 'markdown-it';
import sanitizeHtml from 'sanitize-html';

const md = new MarkdownIt({ html: false, linkify: true, typographer: false });

const allowed: sanitizeHtml.IOptions = {
  allowedTags: [
    'p',
    'br',
    'strong',
    'em',
    'code',
    'pre',
    'blockquote',
    'ul',
    'ol',
    'li',
    'h3',
    'h4',
    'h5',
    'hr',
    'a',
    'table',
    'thead',
    'tbody',
    'tr',
    'th',
    'td',
  ],
  allowedAttributes: { a: ['href', 'title'], th: ['align'], td: ['align'] },
  allowedSchemes: ['http', 'https', 'mailto'],
  transformTags: {
    // headings inside a part page start below the page's own
    h1: 'h3',
    h2: 'h4',
    h6: 'h5',
    a: sanitizeHtml.simpleTransform('a', { rel: 'nofollow noopener noreferrer', target: '_blank' }),
  },
};
allowed.allowedAttributes = { ...allowed.allowedAttributes, a: ['href', 'title', 'rel', 'target'] };

export function renderMarkdown(source: string): string {
  return sanitizeHtml(md.render(source), allowed);
}
