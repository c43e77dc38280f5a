import nodemailer, { type Transporter } from 'nodemailer';

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

export interface Mailer {
  send(message: MailMessage): Promise<void>;
}

export class SmtpMailer implements Mailer {
  private readonly transport: Transporter;

  constructor(
    options: { host: string; port: number },
    private readonly from: string,
  ) {
    // The local catcher speaks plain SMTP; real relays are configured through the same host/port keys.
    this.transport = nodemailer.createTransport({ host: options.host, port: options.port, secure: false, ignoreTLS: true });
  }

  async send(message: MailMessage): Promise<void> {
    await this.transport.sendMail({ from: this.from, ...message });
  }
}

/** Keeps messages in memory; API tests read invite and reset links from it. */
export class MemoryMailer implements Mailer {
  readonly outbox: MailMessage[] = [];

  async send(message: MailMessage): Promise<void> {
    this.outbox.push(message);
  }

  lastTo(to: string): MailMessage | undefined {
    return [...this.outbox].reverse().find((message) => message.to === to);
  }
}
