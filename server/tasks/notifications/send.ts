// Delivers the notification outbox. NUXT_SENDER_SCHEDULED=false stops scheduled runs on this
// instance; with no NUXT_SMTP_URL nothing is sent and the outbox keeps every message.
export default defineTask<SendReport | string>({
  meta: { name: 'notifications:send', description: 'Outbox → SMTP with retries and recorded attempts' },
  async run({ payload }) {
    const config = useRuntimeConfig()
    if (payload.scheduledTime && !config.sender.scheduled) return { result: 'scheduled runs are switched off' }
    const transport = useMailTransport()
    if (!transport) return { result: 'no SMTP relay configured (NUXT_SMTP_URL)' }
    return scheduledWork('notifications:send', payload, () => sendDueMail(useDb(), transport, {
      from: config.mailFrom, publicUrl: config.publicUrl, notifyMaxAgeMinutes: Number(config.notify.maxAgeMinutes),
    }))
  },
})
