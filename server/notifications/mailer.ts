import nodemailer, { type Transporter } from 'nodemailer';

export function createMailTransport({ host, port }: { host: string; port: number }): Transporter {
  // Plain SMTP to the local mail fake or a relay on the same network; a hosted relay would
  // set secure/auth here.
  return nodemailer.createTransport({ host, port, secure: false, ignoreTLS: true, connectionTimeout: 5000, greetingTimeout: 5000, socketTimeout: 10_000 });
}
