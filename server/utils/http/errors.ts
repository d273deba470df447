/** 409: the request is fine but the record's state refuses it (signed, already done, taken). */
export const conflict = (statusMessage: string, data?: unknown) => createError({ statusCode: 409, statusMessage, data })

/** 404: no such record, or one this person may not know exists. */
export const notFound = (statusMessage: string) => createError({ statusCode: 404, statusMessage })

/** 403: signed in and of the event, but this needs another role. */
export const forbidden = (statusMessage: string) => createError({ statusCode: 403, statusMessage })
