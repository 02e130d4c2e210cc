import { useState } from 'react';
import type { MailboxMessage } from '@shared/schemas/auth';
import { EmptyState, Panel } from '@/components/ui/card';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import { LinkedText } from './linked-text';

export function MailboxView({ messages }: { messages: MailboxMessage[] }) {
  const [selected, setSelected] = useState(0);
  if (messages.length === 0) {
    return (
      <Panel>
        <EmptyState>No mail yet. Invitations and plan review notices will show up here.</EmptyState>
      </Panel>
    );
  }
  const index = Math.min(selected, messages.length - 1);
  const message = messages[index];

  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(0,22rem)_minmax(0,1fr)]">
      <Panel title={`Messages (${messages.length})`} className="self-start">
        <ul className="-mx-5 -my-4 divide-y divide-surface-line" aria-label="Messages, newest first">
          {messages.map((m, i) => (
            <li key={`${m.receivedAt}-${i}`}>
              <button
                type="button"
                aria-current={i === index ? 'true' : undefined}
                onClick={() => setSelected(i)}
                className={cn(
                  'block w-full px-5 py-3 text-left focus-visible:outline-2 focus-visible:-outline-offset-2 focus-visible:outline-accent',
                  i === index ? 'bg-accent-soft' : 'hover:bg-surface-sunken',
                )}
              >
                <span className="block truncate text-sm font-semibold text-text-strong">{m.subject}</span>
                <span className="block truncate text-xs text-text-muted">To {m.to}</span>
                <time dateTime={m.receivedAt} className="block text-xs text-text-muted">
                  {formatDateTime(m.receivedAt)}
                </time>
              </button>
            </li>
          ))}
        </ul>
      </Panel>
      <article
        aria-labelledby="mail-subject"
        className="rounded-lg border border-surface-line bg-surface-panel shadow-sm"
      >
        <header className="border-b border-surface-line px-5 py-3">
          <h2 id="mail-subject" className="text-base font-semibold text-text-strong">
            {message.subject}
          </h2>
          <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 text-sm text-text-muted">
            <dt>To</dt>
            <dd className="text-text">{message.to}</dd>
            <dt>Received</dt>
            <dd className="text-text">
              <time dateTime={message.receivedAt}>{formatDateTime(message.receivedAt)}</time>
            </dd>
          </dl>
        </header>
        <div className="px-5 py-4">
          <LinkedText text={message.text} />
        </div>
      </article>
    </div>
  );
}
