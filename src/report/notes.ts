/**
 * Markdown notes → safe HTML. Notes are untrusted: unified + remark-parse reads the Markdown,
 * remark-rehype turns it into HTML nodes with raw HTML left out, and rehype-sanitize (GitHub's
 * allow-list schema, minus images so a note cannot pull anything over the network) removes
 * any script, event handler, iframe or `javascript:` URL that is left.
 */
import rehypeSanitize, { defaultSchema } from 'rehype-sanitize';
import rehypeStringify from 'rehype-stringify';
import remarkParse from 'remark-parse';
import remarkRehype from 'remark-rehype';
import { unified } from 'unified';

const schema = {
  ...defaultSchema,
  tagNames: (defaultSchema.tagNames ?? []).filter(
    (t) => !['img', 'picture', 'source', 'video', 'audio'].includes(t),
  ),
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
