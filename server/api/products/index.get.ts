// The public catalog: every product on sale with its classroom tiers and what is left.
export default defineEventHandler(async () => {
  const catalog = await loadCatalog(useDb(), { activeOnly: true })
  return { data: catalog.map(productView) }
})
