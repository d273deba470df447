import nodemailer, { type Transporter } from 'nodemailer'

let transport: Transporter | undefined

export interface OutgoingMail {
  to: string
  subject: string
  text: string
  attachments?: { filename: string, content: Buffer, contentType?: string }[]
}

/** Sends through the SMTP server in runtimeConfig (the local mail catcher in the demo and tests). */
export async function sendMail(mail: OutgoingMail) {
  const { mail: cfg } = useRuntimeConfig()
  transport ??= nodemailer.createTransport({
    host: cfg.host,
    port: Number(cfg.port),
    secure: cfg.tls === 'implicit',
    requireTLS: cfg.tls === 'starttls',
    ignoreTLS: cfg.tls === 'none',
    auth: cfg.user ? { user: cfg.user, pass: cfg.password } : undefined,
  })
  await transport.sendMail({ from: cfg.from, ...mail })
}
