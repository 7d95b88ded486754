import nodemailer from 'nodemailer';

export interface OutgoingMail {
  to: string[];
  subject: string;
  text: string;
  html?: string | null;
  attachments?: { filename: string; contentType: string; content: string }[] | null;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
}

/** nodemailer over SMTP; the local sink speaks plain SMTP, so TLS is not attempted there. */
export function smtpMailer(url: string, from: string): Mailer {
  const parsed = new URL(url);
  const local = ['127.0.0.1', 'localhost', '::1', '[::1]'].includes(parsed.hostname);
  const transport = nodemailer.createTransport({
    host: parsed.hostname,
    port: Number(parsed.port || 25),
    secure: parsed.protocol === 'smtps:',
    ignoreTLS: local,
    auth: parsed.username ? { user: decodeURIComponent(parsed.username), pass: decodeURIComponent(parsed.password) } : undefined,
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 10000,
  });
  return {
    async send(mail) {
      await transport.sendMail({
        from,
        to: mail.to,
        subject: mail.subject,
        text: mail.text,
        html: mail.html ?? undefined,
        attachments: (mail.attachments ?? []).map((a) => ({ filename: a.filename, contentType: a.contentType, content: a.content })),
      });
    },
  };
}
