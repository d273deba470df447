import { recordBookQuerySchema } from '#shared/schemas/record-book'

// public route: the registry — current records per profile, class and distance with their history,
// every claim with its status, vacant classes with their minimum; filtered by the query.
export default defineEventHandler(event => recordBook(validQuery(event, recordBookQuerySchema)))
