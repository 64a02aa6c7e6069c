import nodemailer from "nodemailer";
import type { SMTPSentMessageInfo, SMTPTransportOptions, Transporter } from "nodemailer";

export interface MailTransportConfig {
  host: string;
  port: number;
  secure?: boolean;
  user?: string;
  pass?: string;
}

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  headers?: Record<string, string>;
}

export type MailTransport = Transporter<SMTPSentMessageInfo, SMTPTransportOptions>;

const LOOPBACK_HOSTS = new Set(["127.0.0.1", "localhost", "::1", "[::1]"]);

/**
 * SMTP transport from explicit config (the env module supplies it).
 * Without `secure`, a loopback host is the local catcher, which offers no TLS, so STARTTLS is
 * skipped; any other host must upgrade with STARTTLS so credentials never travel in clear text.
 */
export function createMailTransport(config: MailTransportConfig): MailTransport {
  const secure = config.secure === true;
  const isLoopback = LOOPBACK_HOSTS.has(config.host.toLowerCase());
  const options: SMTPTransportOptions = {
    host: config.host,
    port: config.port,
    secure,
    ignoreTLS: !secure && isLoopback,
    requireTLS: !secure && !isLoopback,
    // A mail server that is down should fail a send quickly, not hang a request or a job.
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  };
  if (config.user) options.auth = { user: config.user, pass: config.pass ?? "" };
  return nodemailer.createTransport(options);
}

export async function sendMail(
  transport: MailTransport,
  message: OutgoingMail,
  from: string,
): Promise<{ messageId: string }> {
  const info = await transport.sendMail({
    from,
    to: message.to,
    subject: message.subject,
    text: message.text,
    html: message.html,
    headers: message.headers,
  });
  return { messageId: info.messageId };
}
