'use client';
import ReactMarkdown from 'react-markdown';
import rehypeSanitize, { defaultSchema } from 'rehype-sanitize';

/**
 * A drill brief rendered from Markdown. Raw HTML is never rendered (react-markdown skips it),
 * and rehype-sanitize's GitHub-style schema strips what remains unsafe (script URLs and the
 * like). Images may come only from the drill's own uploads or other same-site paths.
 */
const schema = {
  ...defaultSchema,
  protocols: { ...defaultSchema.protocols, src: [] as string[] },
};

export function Markdown({ source, className }: { source: string; className?: string }) {
  return (
    <div className={className ?? 'prose-brief space-y-2 text-sm leading-6 text-slate-800'} data-testid="markdown">
      <ReactMarkdown
        rehypePlugins={[[rehypeSanitize, schema]]}
        components={{
          h1: (p) => <h2 className="text-lg font-semibold text-slate-900" {...p} />,
          h2: (p) => <h3 className="text-base font-semibold text-slate-900" {...p} />,
          h3: (p) => <h4 className="font-semibold text-slate-900" {...p} />,
          ul: (p) => <ul className="list-disc space-y-1 pl-5" {...p} />,
          ol: (p) => <ol className="list-decimal space-y-1 pl-5" {...p} />,
          code: (p) => <code className="rounded bg-slate-100 px-1 font-mono text-[0.85em]" {...p} />,
          a: (p) => <a className="text-accent-700 underline" target="_blank" rel="noreferrer noopener" {...p} />,
          // eslint-disable-next-line @next/next/no-img-element
          img: ({ src, alt }) => (typeof src === 'string' && src.startsWith('/') ? <img src={src} alt={alt ?? ''} className="max-h-96 rounded border border-slate-200" /> : null),
        }}
      >
        {source}
      </ReactMarkdown>
    </div>
  );
}
