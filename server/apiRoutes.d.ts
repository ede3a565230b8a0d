// The build's list of API route files and their methods, generated in nuxt.config.ts (nitro:init).
declare module '#brinkline/api-routes' {
  const routes: ReadonlyArray<{ route: string, method?: string }>
  export default routes
}
