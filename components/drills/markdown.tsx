'use client';
import ReactMarkdown from 'react-markdown';
import rehypeSanitize, { defaultSchema } from 'rehype-sanitize';

/**
 * A drill brief rendered from Markdown. Raw HTML is never rendered (react-markdown skips it),
 * and rehype-sanitize's GitHub-style schema strips what remains unsafe (script URLs and the
 * like). Images may come only from the drill's own uploads: `/api/drills/<this drill>/assets/<id>`
 * (no other site, no other drill's images, no other path of the app).
 */
const schema = {
  ...defaultSchema,
  protocols: { ...defaultSchema.protocols, src: [] as string[] },
};

const UUID = '[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}';

/** True for a brief image address that points at one of the drill's own uploads. */
export function isOwnAsset(src: unknown, drillId: string | null): boolean {
  if (typeof src !== 'string' || !drillId) return false;
  return new RegExp(`^/api/drills/${drillId.replace(/[^0-9a-f-]/gi, '')}/assets/${UUID}$`, 'i').test(src);
}

export function Markdown({ source, className, drillId }: { source: string; className?: string; drillId: string | null }) {
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
          img: ({ src, alt }) => (isOwnAsset(src, drillId) ? <img src={src as string} alt={alt ?? ''} className="max-h-96 rounded border border-slate-200" /> : <span className="text-xs text-slate-500">[image not shown: {alt || 'not one of this drill’s uploads'}]</span>),
        }}
      >
        {source}
      </ReactMarkdown>
    </div>
  );
}
