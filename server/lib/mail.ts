import nodemailer, { type Transporter } from 'nodemailer';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import type { Logger } from './logger';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
}

export interface ReceivedMail {
  to: string;
  from: string;
  subject: string;
  text: string;
  receivedAt: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  /** true when mail goes to the in-process development mail service (the Mailbox page) */
  readonly local: boolean;
  close(): Promise<void>;
}

/**
 * Sends through nodemailer over SMTP. Without SMTP_URL an in-process SMTP server is started on
 * loopback and everything it receives is stored for the Mailbox page: the sending path is the same
 * as in production, only the receiving end is ours.
 */
export async function createMailer(opts: {
  smtpUrl: string | null;
  from: string;
  logger: Logger;
  onReceive: (mail: ReceivedMail) => void;
}): Promise<Mailer> {
  let server: SMTPServer | null = null;
  let transport: Transporter;
  if (opts.smtpUrl) {
    transport = nodemailer.createTransport(opts.smtpUrl);
  } else {
    server = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS'],
      banner: 'Tetherwise development mail service',
      size: 5 * 1024 * 1024,
      logger: false,
      onData(stream, session, callback) {
        simpleParser(stream)
          .then((parsed) => {
            const to = session.envelope.rcptTo.map((r) => r.address).join(', ');
            opts.onReceive({
              to,
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
              subject: parsed.subject ?? '',
              text: parsed.text ?? '',
              receivedAt: new Date().toISOString(),
            });
            callback();
          })
          .catch((err: Error) => callback(err));
      },
    });
    const port = await new Promise<number>((resolve, reject) => {
      server!.once('error', reject);
      server!.listen(0, '127.0.0.1', () => {
        const addr = server!.server.address();
        resolve(typeof addr === 'object' && addr ? addr.port : 0);
      });
    });
    transport = nodemailer.createTransport({ host: '127.0.0.1', port, secure: false, ignoreTLS: true });
    opts.logger.info({ port }, 'development mail service listening on loopback');
  }
  return {
    local: server !== null,
    async send(mail) {
      await transport.sendMail({ from: opts.from, to: mail.to, subject: mail.subject, text: mail.text });
    },
    async close() {
      transport.close();
      if (server) await new Promise<void>((resolve) => server!.close(() => resolve()));
    },
  };
}
