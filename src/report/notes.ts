/**
 * Markdown notes → safe HTML. Notes are untrusted: unified + remark-parse reads the Markdown,
 * remark-rehype turns it into HTML nodes with raw HTML left out, and rehype-sanitize (GitHub's
 * allow-list schema, narrowed to text and tables) removes
 * any script, event handler, iframe or `javascript:` URL that is left.
 */
import rehypeSanitize, { defaultSchema } from 'rehype-sanitize';
import rehypeStringify from 'rehype-stringify';
import remarkParse from 'remark-parse';
import remarkRehype from 'remark-rehype';
import { unified } from 'unified';

// An explicit allow-list of text and table elements: no media or embedded content, so a note
// can neither run anything nor pull anything over the network.
const ALLOWED_TAGS = [
  'h1',
  'h2',
  'h3',
  'h4',
  'h5',
  'h6',
  'p',
  'br',
  'hr',
  'a',
  'strong',
  'em',
  'del',
  'code',
  'pre',
  'blockquote',
  'ul',
  'ol',
  'li',
  'table',
  'thead',
  'tbody',
  'tr',
  'th',
  'td',
  'sup',
  'sub',
  'input',
  'section',
];

const schema = {
  ...defaultSchema,
  tagNames: (defaultSchema.tagNames ?? []).filter((t) => ALLOWED_TAGS.includes(t)),
  protocols: { ...defaultSchema.protocols, href: ['http', 'https', 'mailto'] },
  clobberPrefix: 'note-',
};

const processor = unified()
  .use(remarkParse)
  .use(remarkRehype, { allowDangerousHtml: false })
  .use(rehypeSanitize, schema)
  .use(rehypeStringify);

export function renderNotes(markdown: string): string {
  if (markdown.trim() === '') return '';
  return String(processor.processSync(markdown));
}
