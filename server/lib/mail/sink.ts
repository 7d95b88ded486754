import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import type { AddressInfo } from 'node:net';

export interface SinkMessage {
  id: number;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  attachments: { filename: string; contentType: string; size: number; content: string }[];
}

/** A local SMTP server that keeps what it receives: the embedded default when no SMTP_URL is set. */
export class MailSink {
  readonly messages: SinkMessage[] = [];
  private server: SMTPServer;
  private nextId = 1;
  port = 0;

  constructor(private readonly limit = 500) {
    this.server = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS'],
      logger: false,
      onData: (stream, session, callback) => {
        simpleParser(stream)
          .then((mail) => {
            const to = session.envelope.rcptTo.map((r) => r.address);
            this.messages.push({
              id: this.nextId++,
              receivedAt: new Date().toISOString(),
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
              to,
              subject: mail.subject ?? '',
              text: mail.text ?? '',
              html: typeof mail.html === 'string' ? mail.html : null,
              attachments: mail.attachments.map((a) => ({
                filename: a.filename ?? 'attachment',
                contentType: a.contentType,
                size: a.size,
                content: a.content.toString('utf8'),
              })),
            });
            if (this.messages.length > this.limit) this.messages.splice(0, this.messages.length - this.limit);
            callback();
          })
          .catch((e: Error) => callback(e));
      },
    });
  }

  listen(port: number, host = '127.0.0.1'): Promise<number> {
    return new Promise((resolve, reject) => {
      this.server.once('error', reject);
      this.server.listen(port, host, () => {
        this.port = (this.server.server.address() as AddressInfo).port;
        resolve(this.port);
      });
    });
  }

  close(): Promise<void> {
    return new Promise((resolve) => this.server.close(() => resolve()));
  }

  /** Messages sent to an address, newest last. */
  to(address: string): SinkMessage[] {
    const a = address.toLowerCase();
    return this.messages.filter((m) => m.to.some((t) => t.toLowerCase() === a));
  }
}
