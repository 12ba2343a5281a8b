import { z } from 'zod'
import { API } from '../../shared/api-paths'
import { CapturedMailList, OutgoingMail } from '../../shared/schemas/mail'
import { http } from './http'

const OutgoingMailList = z.object({ messages: z.array(OutgoingMail) })

/** Admin-only views of mail, for demo and development set-ups. */
export const mailApi = {
  captured: () => http.get(API.capturedMail, { schema: CapturedMailList }),
  outgoing: async () => (await http.get(API.outgoingMail, { schema: OutgoingMailList })).messages,
}
