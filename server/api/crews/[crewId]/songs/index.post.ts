import { SongCreateSchema } from '../../../../../shared/schemas/songs'
import { songs } from '../../../../database/schema'

export default defineEventHandler(async (event) => {
  const crewId = idParam(event, 'crewId', 'Crew')
  const { user } = await requireCrewAccess(event, crewId, 'song.create')
  const { title } = await validBody(event, SongCreateSchema)
  const [song] = await useDb().insert(songs).values({ crewId, title, createdBy: user.id }).returning({ id: songs.id, title: songs.title })
  setResponseStatus(event, 201)
  return song!
})
