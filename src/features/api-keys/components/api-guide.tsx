import { Fragment, type ReactNode } from 'react';
import { Link } from 'react-router';
import { PanelError } from '@/components/errors/error-panel';
import { Badge, type BadgeTone } from '@/components/ui/badge';
import { Card } from '@/components/ui/card';
import { TextLink } from '@/components/ui/link';
import { Spinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { useApiDocument } from '../api/get-api-document';
import {
  KEY_PLACEHOLDER,
  curlFor,
  exampleOf,
  fieldRows,
  operationsOf,
  resolve,
  typeWords,
  type OpenApiDocument,
  type OperationEntry,
} from '../utils/openapi';

const methodTone: Record<OperationEntry['method'], BadgeTone> = { get: 'info', post: 'brand', put: 'warning', patch: 'warning', delete: 'danger' };

/** Descriptions mark code with backticks; show those parts as code. */
function Prose({ text, className }: { text?: string; className?: string }) {
  if (!text) return null;
  const parts = text.split('`');
  return (
    <p className={className}>
      {parts.map((part, index) =>
        index % 2 === 1 ? (
          <code key={index} className="rounded bg-paper-sunken px-1 font-mono text-[0.85em] text-ink-strong">
            {part}
          </code>
        ) : (
          <Fragment key={index}>{part}</Fragment>
        ),
      )}
    </p>
  );
}

function CodeBlock({ label, children }: { label: string; children: string }) {
  return (
    <figure className="min-w-0">
      <figcaption className="mb-1 text-xs font-semibold tracking-wide text-ink-muted uppercase">{label}</figcaption>
      {/* Focusable so that keyboard users can scroll long examples sideways. */}
      <pre tabIndex={0} className="focus-ring max-h-96 overflow-auto rounded-control bg-spruce-900 p-3 font-mono text-xs leading-relaxed text-paper">
        {children}
      </pre>
    </figure>
  );
}

function SmallTable({ caption, head, rows }: { caption: string; head: string[]; rows: ReactNode[][] }) {
  return (
    <div className="overflow-x-auto rounded-control border border-ink-hairline">
      <table className="w-full border-collapse text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className="bg-paper-sunken/60">
          <tr>
            {head.map((h) => (
              <th key={h} scope="col" className="px-3 py-2 text-xs font-semibold tracking-wide text-ink-muted uppercase">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((row, i) => (
            <tr key={i} className="border-t border-ink-hairline align-top">
              {row.map((cell, j) => (
                <td key={j} className="px-3 py-2">
                  {cell}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function OperationCard({ doc, entry }: { doc: OpenApiDocument; entry: OperationEntry }) {
  const { operation, method, path } = entry;
  const title = operation.summary ?? `${method.toUpperCase()} ${path}`;
  const parameters = operation.parameters ?? [];
  const bodyTypes = Object.entries(operation.requestBody?.content ?? {});
  const responses = Object.entries(operation.responses ?? {});
  const success = responses.find(([code]) => code.startsWith('2'));
  const successExample = success ? exampleOf(doc, success[1].content?.['application/json']) : undefined;
  const needsKey = (operation.security ?? doc.security ?? []).length > 0;

  return (
    <section id={entry.id} aria-labelledby={`${entry.id}-title`} className="scroll-mt-6 rounded-panel border border-ink-hairline bg-paper-raised shadow-panel">
      <div className="border-b border-ink-hairline px-5 py-4">
        <h3 id={`${entry.id}-title`} className="text-base font-semibold text-ink-strong">
          {title}
        </h3>
        <p className="mt-1 flex flex-wrap items-center gap-2">
          <Badge tone={methodTone[method]}>{method.toUpperCase()}</Badge>
          <code className="font-mono text-sm break-all text-ink-strong">{path}</code>
          {needsKey ? null : <span className="text-xs text-ink-muted">No key needed</span>}
        </p>
      </div>
      <div className="flex flex-col gap-4 px-5 py-4">
        <Prose text={operation.description} className="text-sm text-ink" />
        {parameters.length > 0 ? (
          <div>
            <h4 className="mb-2 text-sm font-semibold text-ink-strong">Parameters</h4>
            <SmallTable
              caption={`Parameters of ${title}`}
              head={['Name', 'In', 'Type', 'What it does']}
              rows={parameters.map((p) => [
                <code key="n" className="font-mono">
                  {p.name}
                  {p.required ? <span className="text-brick-text"> (required)</span> : null}
                </code>,
                p.in === 'query' ? 'query string' : p.in,
                typeWords(doc, p.schema),
                <Prose key="d" text={p.description ?? resolve(doc, p.schema)?.description} />,
              ])}
            />
          </div>
        ) : null}
        {bodyTypes.map(([contentType, media]) => {
          const rows = fieldRows(doc, media.schema);
          const example = exampleOf(doc, media);
          return (
            <div key={contentType} className="flex flex-col gap-3">
              <h4 className="text-sm font-semibold text-ink-strong">
                Body <span className="font-normal text-ink-muted">({contentType})</span>
              </h4>
              {rows.length > 0 ? (
                <SmallTable
                  caption={`Body fields of ${title}`}
                  head={['Field', 'Type', 'Notes']}
                  rows={rows.map((r) => [
                    <code key="n" className="font-mono whitespace-nowrap">
                      {r.name}
                      {r.required ? <span className="text-brick-text"> (required)</span> : null}
                    </code>,
                    <span key="t" className="break-words">{r.type}</span>,
                    <Prose key="d" text={r.notes} className="text-ink-muted" />,
                  ])}
                />
              ) : null}
              {example !== undefined ? <CodeBlock label="Example body">{JSON.stringify(example, null, 2)}</CodeBlock> : null}
            </div>
          );
        })}
        <CodeBlock label="Try it with curl">{curlFor(doc, entry)}</CodeBlock>
        {responses.length > 0 ? (
          <div>
            <h4 className="mb-2 text-sm font-semibold text-ink-strong">Answers</h4>
            <SmallTable
              caption={`Answers of ${title}`}
              head={['Status', 'When']}
              rows={responses.map(([code, response]) => [<code key="c" className="font-mono">{code}</code>, <Prose key="d" text={response.description} />])}
            />
          </div>
        ) : null}
        {successExample !== undefined ? (
          <details className="rounded-control border border-ink-hairline px-3 py-2">
            <summary className="focus-ring cursor-pointer rounded-sm text-sm font-semibold text-spruce-700">Example answer ({success?.[0]})</summary>
            <div className="mt-2">
              <CodeBlock label={`Answer ${success?.[0]}`}>{JSON.stringify(successExample, null, 2)}</CodeBlock>
            </div>
          </details>
        ) : null}
      </div>
    </section>
  );
}

/** The partner API, read from its own OpenAPI document and laid out for a shop's developer. */
export function ApiGuide() {
  const document = useApiDocument();
  if (document.isPending) return <Spinner label="Loading the API description" />;
  if (document.isError) return <PanelError title="The API description could not be loaded" onRetry={() => void document.refetch()} />;
  const doc = document.data;
  const operations = operationsOf(doc);
  const tags = [...(doc.tags ?? []).map((t) => t.name), ...operations.flatMap((o) => o.operation.tags ?? ['Other'])].filter((t, i, all) => all.indexOf(t) === i);
  const server = doc.servers?.[0]?.url ?? window.location.origin;
  const scheme = Object.values(doc.components?.securitySchemes ?? {})[0];

  return (
    <div className="grid gap-6 lg:grid-cols-[14rem_minmax(0,1fr)] lg:items-start">
      <nav aria-label="Operations" className="lg:sticky lg:top-4">
        <ul className="flex flex-col gap-3 text-sm">
          {tags.map((tag) => (
            <li key={tag}>
              <p className="text-xs font-semibold tracking-wide text-ink-muted uppercase">{tag}</p>
              <ul className="mt-1 flex flex-col gap-1">
                {operations
                  .filter((o) => (o.operation.tags ?? ['Other']).includes(tag))
                  .map((o) => (
                    <li key={o.id}>
                      <a href={`#${o.id}`} className="focus-ring rounded-sm text-spruce-700 hover:underline">
                        {o.operation.summary ?? o.path}
                      </a>
                    </li>
                  ))}
              </ul>
            </li>
          ))}
        </ul>
      </nav>
      <div className="flex min-w-0 flex-col gap-8">
        <Card title="Getting started" description={`${doc.info.title}, version ${doc.info.version}`}>
          <div className="flex flex-col gap-3 text-sm text-ink">
            <Prose text={doc.info.description} />
            <ol className="list-decimal pl-5">
              <li>
                Create a key on the <TextLink to={paths.partner.apiKeys.getHref()}>API keys</TextLink> page and store it with your system’s secrets.
              </li>
              <li>
                Send it with every request as <code className="font-mono">Authorization: Bearer {KEY_PLACEHOLDER}</code>.
                {scheme?.description ? <span className="text-ink-muted"> {scheme.description}</span> : null}
              </li>
              <li>
                Requests go to <code className="font-mono break-all">{server}</code>. Replace <code className="font-mono">{KEY_PLACEHOLDER}</code> in the examples below with your key.
              </li>
            </ol>
            <p className="text-ink-muted">
              The same description as a file, for tools that read OpenAPI 3.1:{' '}
              <Link reloadDocument to="/api/v1/openapi.json" className="focus-ring rounded-sm font-semibold text-spruce-700 underline underline-offset-4">
                openapi.json
              </Link>
              .
            </p>
          </div>
        </Card>
        {tags.map((tag) => {
          const inTag = operations.filter((o) => (o.operation.tags ?? ['Other']).includes(tag));
          if (inTag.length === 0) return null;
          const description = doc.tags?.find((t) => t.name === tag)?.description;
          return (
            <section key={tag} aria-labelledby={`tag-${tag}`} className="flex flex-col gap-4">
              <div>
                <h2 id={`tag-${tag}`} className="text-lg font-semibold text-ink-strong">
                  {tag}
                </h2>
                {description ? <p className="text-sm text-ink-muted">{description}</p> : null}
              </div>
              {inTag.map((entry) => (
                <OperationCard key={entry.id} doc={doc} entry={entry} />
              ))}
            </section>
          );
        })}
      </div>
    </div>
  );
}
