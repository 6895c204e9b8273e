// E-mail goes out through the durable jobs (server/utils/jobs.ts, kind `mail`): written in
// the transaction of the change that causes it, so a mail exists exactly when its change
// does, and delivered with retries, so an SMTP outage delays mail but loses none.
import { queueMail } from '../jobs/mail'

export const enqueueMail = queueMail
