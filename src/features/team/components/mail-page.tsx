import { useSearchParams } from 'react-router';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { useMail } from '../api/get-mail.ts';
import { useMailMessage } from '../api/get-mail-message.ts';
import { useDocumentTitle } from '../../../lib/document-title.ts';

const URL_PATTERN = /(https?:\/\/[^\s<>"]+)/g;

/** Plain message text with its web addresses made into links (an invite link can be followed from here). */
function MessageText({ text }: { text: string }) {
  const parts = text.split(URL_PATTERN);
  return (
    <>
      {parts.map((part, i) =>
        i % 2 === 1 ? (
          <a key={i} href={part} className="num break-all text-accent underline underline-offset-2">
            {part}
          </a>
        ) : (
          <span key={i}>{part}</span>
        ),
      )}
    </>
  );
}

/** Outgoing mail (owner): what the server sent, so invitations can be followed without a mail server. */
export function MailPage() {
  useDocumentTitle('Outgoing mail');
  const mail = useMail();
  const [search, setSearch] = useSearchParams();
  const selected = search.get('message');
  const message = useMailMessage(selected);

  return (
    <div className="mx-auto flex max-w-6xl flex-col gap-3">
      <div>
        <h1 className="text-lg">Outgoing mail</h1>
        <p className="text-[13px] text-ink-muted">Every message this server sent or is sending, newest first. Without a mail server set up, they go to a local stand-in that keeps them here and delivers nothing.</p>
      </div>
      <div className="grid grid-cols-[minmax(0,1fr)] gap-4 md:grid-cols-[22rem_minmax(0,1fr)]">
        <section aria-labelledby="mail-list-title" className="rounded-[4px] border border-rule bg-panel">
          <h2 id="mail-list-title" className="border-b border-rule px-4 py-2 text-[13px] uppercase tracking-wide text-ink-muted">
            Messages {mail.data ? <span className="num">({mail.data.items.length})</span> : null}
          </h2>
          {mail.isPending ? (
            <Loading label="Loading messages…" />
          ) : mail.isError ? (
            <div className="p-3">
              <Notice tone="error" title={mail.error.message} />
            </div>
          ) : mail.data.items.length === 0 ? (
            <p className="px-4 py-3 text-sm text-ink-muted">No mail has been sent yet.</p>
          ) : (
            <ul className="divide-y divide-rule">
              {mail.data.items.map((m) => (
                <li key={m.id}>
                  <button
                    type="button"
                    aria-current={selected === m.id ? 'true' : undefined}
                    onClick={() => setSearch({ message: m.id })}
                    className={`block w-full px-4 py-2 text-left text-[13px] hover:bg-sunken ${selected === m.id ? 'border-l-4 border-accent bg-accent-soft pl-3' : ''}`}
                  >
                    <span className="block truncate font-semibold">{m.subject}</span>
                    <span className="num block truncate text-ink-muted">to {m.to}</span>
                    <span className="num block text-[12px] text-ink-faint">{formatDateTime(m.sentAt)}</span>
                    {m.delivered ? null : <span className="block text-[12px] text-caution">Not sent yet: the server keeps trying</span>}
                  </button>
                </li>
              ))}
            </ul>
          )}
        </section>
        <section aria-labelledby="mail-view-title" className="min-w-0 rounded-[4px] border border-rule bg-panel">
          <h2 id="mail-view-title" className="sr-only">
            Message
          </h2>
          {selected === null ? (
            <p className="px-4 py-3 text-sm text-ink-muted">Choose a message to read it.</p>
          ) : message.isPending ? (
            <Loading label="Loading the message…" />
          ) : message.isError ? (
            <div className="p-3">
              <Notice tone="error" title={message.error.message} />
            </div>
          ) : (
            <article>
              <header className="border-b border-rule px-4 py-2">
                <p className="text-base font-semibold">{message.data.subject}</p>
                <dl className="mt-1 grid grid-cols-[max-content_1fr] gap-x-3 text-[13px]">
                  <dt className="text-ink-muted">From</dt>
                  <dd className="num">{message.data.from}</dd>
                  <dt className="text-ink-muted">To</dt>
                  <dd className="num">{message.data.to}</dd>
                  <dt className="text-ink-muted">Sent</dt>
                  <dd className="num">{formatDateTime(message.data.sentAt)}</dd>
                </dl>
              </header>
              {/* The plain-text part only: no HTML from a message is rendered in the app. */}
              <div className="px-4 py-3 text-sm whitespace-pre-wrap break-words">
                <MessageText text={message.data.text} />
              </div>
            </article>
          )}
        </section>
      </div>
    </div>
  );
}
