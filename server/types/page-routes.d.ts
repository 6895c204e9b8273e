// Made by modules/page-routes.ts at build time: each page's path as a regular expression.
declare module '#page-routes' {
  const patterns: string[]
  export default patterns
}
