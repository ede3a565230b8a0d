import postgres from 'postgres'

/** Direct access to the test database, for checking what a route stored. */
export function testSql() {
  const url = process.env.NUXT_DATABASE_URL
  if (!url) throw new Error('NUXT_DATABASE_URL is not set: run the suite through `npm test`')
  return postgres(url, { max: 2, onnotice: () => {} })
}
