// Replies that many routes share.

/** A create answers 201 with the new row's id. */
export interface CreatedReply {
  id: number
}
/** A change with nothing more to say. */
export interface OkReply {
  ok: true
}
/** A change whose answer is a sentence for the person (the same whoever asked). */
export interface MessageReply {
  message: string
}
/** A PDF or an uploaded file, sent as bytes with its own headers. */
export type FileReply = Buffer
