// One entry point for drizzle-kit and the app; each area keeps its tables in schema/<area>.ts.
export * from './schema/common'
export * from './schema/auth'
export * from './schema/crews'
export * from './schema/mail'
export * from './schema/songs'
export * from './schema/drafts'
export * from './schema/finish'
export * from './schema/lexicon'
