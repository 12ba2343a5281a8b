import nodemailer, { type Transporter } from 'nodemailer'

/** Real SMTP when a URL is given, otherwise the local fake server on loopback (no TLS there). */
export function createMailTransport(opts: { smtpUrl?: string; fakePort?: number }): Transporter {
  if (opts.smtpUrl) return nodemailer.createTransport(opts.smtpUrl)
  return nodemailer.createTransport({
    host: '127.0.0.1',
    port: opts.fakePort,
    secure: false,
    ignoreTLS: true,
    connectionTimeout: 3000,
    greetingTimeout: 3000,
    socketTimeout: 10000,
  })
}
