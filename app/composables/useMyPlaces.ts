/** The signed-in person's roles and teams at one event, read from /api/me. */
export async function useMyPlaces(eventId: Ref<string>) {
  const { data: me } = await useFetch('/api/me', { key: 'me' })
  const here = computed(() => me.value?.memberships.filter(m => m.eventId === Number(eventId.value)) ?? [])
  return {
    me,
    roles: computed(() => new Set(here.value.map(m => m.role))),
    teamIds: computed(() => new Set(here.value.flatMap(m => (m.teamId ? [m.teamId] : [])))),
    /** True when every role held here is a team's: such a person sees their own team's records only. */
    onlyTeam: computed(() => here.value.length > 0 && here.value.every(m => m.role === 'team')),
  }
}
