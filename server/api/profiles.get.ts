import { profiles } from '#shared/rules/profiles'

// public route: the library of rule profiles with every value's source.
export default defineEventHandler(() => Object.values(profiles))
