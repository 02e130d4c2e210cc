import crypto from 'node:crypto';
import type { Request, Response } from 'express';
import type { ChangeEvent, HelloEvent, PresenceEvent, Viewer } from '@shared/schemas/events';
import { HttpError, notFound } from '../../lib/http-error';

export interface EventHubOptions {
  /** a comment line this often on every stream, so proxies keep it open and dead peers show */
  heartbeatMs: number;
  /** recent changes kept to replay to a stream that reconnects with `Last-Event-ID` */
  ringSize: number;
  /** bytes a stream may have waiting in the server; a client that falls further behind is dropped */
  clientBufferBytes: number;
  /** streams open at once, all users together */
  maxClients: number;
  /** streams open at once for one person (tabs, screens on the wall) */
  maxClientsPerUser: number;
}

interface Client {
  id: string;
  viewer: Viewer;
  res: Response;
  watching: number | null;
}

export interface EventHubStats {
  clients: number;
  /** bytes written to streams and not yet taken by the socket, all streams together */
  bufferedBytes: number;
  /** the most any one stream holds */
  maxBufferedBytes: number;
  /** streams dropped for falling behind since start */
  dropped: number;
  ring: number;
}

const frame = (event: string, data: unknown, id?: string) =>
  `${id === undefined ? '' : `id: ${id}\n`}event: ${event}\ndata: ${JSON.stringify(data)}\n\n`;

/**
 * The live stream's hub: every open `GET /api/events` stream, a bounded ring of recent changes for
 * reconnects, and who has which plan open. Writes never queue without bound: a stream whose socket
 * does not take what it is sent is closed once it holds `clientBufferBytes`, and its browser
 * reconnects and replays from the ring (or is told to reload everything when it fell out of it).
 */
export class EventHub {
  /** ids are `<boot>.<seq>`: an id from before a restart is recognised as unknown, never misread */
  private readonly boot = crypto.randomBytes(4).toString('hex');
  private seq = 0;
  private readonly ring: { seq: number; frame: string }[] = [];
  private readonly clients = new Map<string, Client>();
  private readonly timer: NodeJS.Timeout;
  private droppedCount = 0;
  readonly options: EventHubOptions;

  constructor(options: EventHubOptions) {
    this.options = options;
    this.timer = setInterval(() => this.heartbeat(), this.options.heartbeatMs);
    this.timer.unref();
  }

  /** Tells every open stream what changed. */
  publish(change: ChangeEvent) {
    const seq = ++this.seq;
    const text = frame('change', change, `${this.boot}.${seq}`);
    this.ring.push({ seq, frame: text });
    if (this.ring.length > this.options.ringSize) this.ring.shift();
    for (const c of this.clients.values()) this.send(c, text);
  }

  /** Opens a stream on `res` for a signed-in person, replaying what they missed since `lastEventId`. */
  open(req: Request, res: Response, viewer: Viewer, lastEventId: string | undefined) {
    if (this.clients.size >= this.options.maxClients)
      throw new HttpError('UNAVAILABLE', 'Too many live streams are open; try again shortly.');
    let own = 0;
    for (const c of this.clients.values()) if (c.viewer.userId === viewer.userId) own++;
    if (own >= this.options.maxClientsPerUser)
      throw new HttpError(
        'RATE_LIMITED',
        `At most ${this.options.maxClientsPerUser} live streams per person; close a tab or screen.`,
      );
    const client: Client = { id: crypto.randomBytes(12).toString('base64url'), viewer, res, watching: null };
    res.status(200);
    res.setHeader('Content-Type', 'text/event-stream; charset=utf-8');
    res.setHeader('Cache-Control', 'no-store');
    res.setHeader('Connection', 'keep-alive');
    // reverse proxies that buffer answers pass this one on as it comes
    res.setHeader('X-Accel-Buffering', 'no');
    res.flushHeaders();
    req.socket.setNoDelay(true);
    this.clients.set(client.id, client);
    res.on('close', () => this.remove(client));
    let text = `retry: 3000\n\n${frame('hello', { connection: client.id } satisfies HelloEvent)}`;
    const missed = this.since(lastEventId);
    if (missed === null) text += frame('reset', {});
    else for (const m of missed) text += m;
    this.send(client, text);
  }

  /** The frames after `lastEventId`; null when that id is not one this hub can replay from. */
  private since(lastEventId: string | undefined): string[] | null {
    if (lastEventId === undefined || lastEventId === '') return [];
    const [boot, seqText] = lastEventId.split('.');
    const seq = Number(seqText);
    if (boot !== this.boot || !Number.isInteger(seq) || seq > this.seq) return null;
    const oldest = this.ring[0]?.seq ?? this.seq + 1;
    if (seq < oldest - 1) return null;
    return this.ring.filter((r) => r.seq > seq).map((r) => r.frame);
  }

  /** The plan a stream's screen shows now; everyone looking at the old and the new plan is told. */
  setPresence(connection: string, userId: number, planId: number | null): PresenceEvent | null {
    const client = this.clients.get(connection);
    if (!client || client.viewer.userId !== userId) throw notFound('Live stream');
    const before = client.watching;
    client.watching = planId;
    if (before !== null && before !== planId) this.tellPresence(before);
    if (planId === null) return null;
    if (before !== planId) this.tellPresence(planId);
    return this.presenceOf(planId);
  }

  presenceOf(planId: number): PresenceEvent {
    const viewers = new Map<number, Viewer>();
    for (const c of this.clients.values()) if (c.watching === planId) viewers.set(c.viewer.userId, c.viewer);
    return { planId, viewers: [...viewers.values()].sort((a, b) => a.name.localeCompare(b.name)) };
  }

  stats(): EventHubStats {
    let bufferedBytes = 0;
    let maxBufferedBytes = 0;
    for (const c of this.clients.values()) {
      bufferedBytes += c.res.writableLength;
      maxBufferedBytes = Math.max(maxBufferedBytes, c.res.writableLength);
    }
    return {
      clients: this.clients.size,
      bufferedBytes,
      maxBufferedBytes,
      dropped: this.droppedCount,
      ring: this.ring.length,
    };
  }

  close() {
    clearInterval(this.timer);
    for (const c of [...this.clients.values()]) {
      this.clients.delete(c.id);
      c.res.end();
    }
  }

  private tellPresence(planId: number) {
    const text = frame('presence', this.presenceOf(planId));
    for (const c of this.clients.values()) if (c.watching === planId) this.send(c, text);
  }

  private heartbeat() {
    for (const c of [...this.clients.values()]) this.send(c, ': keep-alive\n\n');
  }

  private send(client: Client, text: string) {
    const { res } = client;
    if (res.destroyed || res.writableEnded) return this.remove(client);
    if (res.writableLength + Buffer.byteLength(text) > this.options.clientBufferBytes) {
      this.droppedCount++;
      res.destroy();
      return this.remove(client);
    }
    res.write(text);
  }

  private remove(client: Client) {
    if (this.clients.get(client.id) !== client) return;
    this.clients.delete(client.id);
    if (client.watching !== null) this.tellPresence(client.watching);
  }
}
