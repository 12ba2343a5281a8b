import { z } from 'zod'

/** A message captured by the local fake SMTP server (demo and development only). */
export const CapturedMail = z.object({
  id: z.number().int(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  attachments: z.array(z.object({ filename: z.string(), contentType: z.string(), size: z.number() })),
})
export type CapturedMail = z.infer<typeof CapturedMail>
export const CapturedMailList = z.object({ enabled: z.boolean(), messages: z.array(CapturedMail) })

/** A message in Driftwarden's own outgoing queue, with its delivery state. */
export const OutgoingMail = z.object({
  id: z.number().int(),
  to: z.string(),
  subject: z.string(),
  status: z.enum(['pending', 'sent', 'failed']),
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  createdAt: z.string(),
  sentAt: z.string().nullable(),
})
export type OutgoingMail = z.infer<typeof OutgoingMail>
export const OutgoingMailList = z.object({ messages: z.array(OutgoingMail) })
