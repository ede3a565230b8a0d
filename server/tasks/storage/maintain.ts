// The storage job (docs/architecture.md, "Sample storage"): partitions, raw windows, size snapshots.
// Scheduled runs can be switched off per instance with NUXT_STORAGE_SCHEDULED=false.
export default defineTask<MaintenanceReport | string>({
  meta: { name: 'storage:maintain', description: 'Sample partitions ahead, raw windows applied (archive first), size snapshot' },
  async run({ payload }) {
    if (payload.scheduledTime && !useRuntimeConfig().storage.scheduled) return { result: 'scheduled runs are switched off' }
    // As the schema owner: the job makes, analyses and drops partitions.
    return scheduledWork('storage:maintain', payload, () => runStorageMaintenance(useOwnerDb()))
  },
})
