// Mount the uploads storage from the environment at start, so a bad S3 setting fails loudly here.
export default defineNitroPlugin(() => {
  try {
    const { description } = uploadsDriver()
    uploadsStorage()
    console.info(`[tightwell] uploads stored in ${description}`)
  }
  catch (error) {
    console.error('[tightwell] upload storage:', (error as Error).message)
  }
})
