import type { RuleProfile } from '../profile'
import { clubSameDirection } from './club-same-direction'
import { intlAutomobile } from './intl-automobile'
import { intlMotorcycle } from './intl-motorcycle'

export const PROFILE_IDS = ['intl-motorcycle', 'intl-automobile', 'club-same-direction'] as const
export type ProfileId = (typeof PROFILE_IDS)[number]

export const profiles: Record<ProfileId, RuleProfile> = {
  'intl-motorcycle': intlMotorcycle,
  'intl-automobile': intlAutomobile,
  'club-same-direction': clubSameDirection,
}

/** A deep copy, to adapt to a local rulebook or to freeze into an attempt. */
export function copyProfile(profile: RuleProfile, changes: Partial<RuleProfile> = {}): RuleProfile {
  return { ...structuredClone(profile), ...structuredClone(changes) }
}
