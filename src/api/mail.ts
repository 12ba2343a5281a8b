import { API } from '../../shared/api-paths'
import { CapturedMailList, OutgoingMailList } from '../../shared/schemas/mail'
import { http } from './http'

/** Admin-only views of mail, for demo and development set-ups. */
export const mailApi = {
  captured: () => http.get(API.capturedMail, { schema: CapturedMailList }),
  outgoing: async () => (await http.get(API.outgoingMail, { schema: OutgoingMailList })).messages,
}
