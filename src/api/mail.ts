import { contract } from '../../shared/contract'
import { call } from './http'

/** Admin-only views of mail, for demo and development set-ups. */
export const mailApi = {
  captured: () => call(contract.system.capturedMail),
  outgoing: async () => (await call(contract.system.outgoingMail)).messages,
}
