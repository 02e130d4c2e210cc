/** One message of a Server-Sent Events stream as a browser's EventSource parses it. */
export interface StreamMessage {
  event: string;
  data: string;
  id?: string;
  /** a comment line (`: …`), such as a heartbeat */
  comment?: string;
  /** ms since the stream was opened */
  at: number;
}

export interface OpenStream {
  status: number;
  headers: Headers;
  messages: StreamMessage[];
  /** when the request was sent (epoch ms): a message arrived at `openedAt + at` */
  openedAt: number;
  /** bytes read so far */
  bytes(): number;
  /** the first message (from the start of the stream) that matches, waiting at most `timeoutMs` */
  next(match: (m: StreamMessage) => boolean, timeoutMs?: number): Promise<StreamMessage>;
  close(): void;
}

/**
 * `GET /api/events` with `cookie`, read as a browser would (fields per the Server-Sent Events
 * format: `event`, `data`, `id`, comments).
 */
export async function openEventStream(
  base: string,
  cookie: string | null,
  headers: Record<string, string> = {},
): Promise<OpenStream> {
  const abort = new AbortController();
  const opened = Date.now();
  const res = await fetch(`${base}/api/events`, {
    headers: { accept: 'text/event-stream', ...(cookie ? { cookie } : {}), ...headers },
    signal: abort.signal,
  });
  const messages: StreamMessage[] = [];
  const waiters = new Set<() => unknown>();
  let received = 0;
  if (res.ok && res.body) {
    const reader = res.body.pipeThrough(new TextDecoderStream()).getReader();
    void (async () => {
      let buffer = '';
      const encoder = new TextEncoder();
      try {
        for (;;) {
          const { value, done } = await reader.read();
          if (done) break;
          buffer += value;
          received += encoder.encode(value).length;
          const blocks = buffer.split('\n\n');
          buffer = blocks.pop()!;
          for (const block of blocks) {
            const m: StreamMessage = { event: 'message', data: '', at: Date.now() - opened };
            const data: string[] = [];
            for (const line of block.split('\n')) {
              const colon = line.indexOf(':');
              const field = colon < 0 ? line : line.slice(0, colon);
              const value = colon < 0 ? '' : line.slice(colon + 1).replace(/^ /, '');
              if (field === '') m.comment = value;
              else if (field === 'event') m.event = value;
              else if (field === 'data') data.push(value);
              else if (field === 'id') m.id = value;
            }
            m.data = data.join('\n');
            if (m.comment !== undefined || data.length > 0) messages.push(m);
          }
          for (const w of waiters) w();
        }
      } catch {
        // aborted by close()
      }
    })();
  }
  return {
    status: res.status,
    headers: res.headers,
    messages,
    openedAt: opened,
    bytes: () => received,
    next(match, timeoutMs = 2000) {
      return new Promise((resolve, reject) => {
        const check = () => {
          const found = messages.find(match);
          if (!found) return false;
          waiters.delete(check);
          clearTimeout(timer);
          resolve(found);
          return true;
        };
        const timer = setTimeout(() => {
          waiters.delete(check);
          reject(new Error(`no matching message within ${timeoutMs} ms; got ${JSON.stringify(messages)}`));
        }, timeoutMs);
        if (!check()) waiters.add(check);
      });
    },
    close: () => abort.abort(),
  };
}
