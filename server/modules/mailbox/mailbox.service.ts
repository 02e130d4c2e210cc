import { desc } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { mailboxMessages } from '../../db/schema';
import type { ReceivedMail } from '../../lib/mail';
import type { MailboxMessage } from '@shared/schemas/auth';

export function storeMessage(db: Db, mail: ReceivedMail): void {
  db.insert(mailboxMessages).values(mail).run();
}

export function listMessages(db: Db): MailboxMessage[] {
  return db
    .select({
      to: mailboxMessages.to,
      subject: mailboxMessages.subject,
      text: mailboxMessages.text,
      receivedAt: mailboxMessages.receivedAt,
    })
    .from(mailboxMessages)
    .orderBy(desc(mailboxMessages.id))
    .all();
}

export function clearMessages(db: Db): void {
  db.delete(mailboxMessages).run();
}
