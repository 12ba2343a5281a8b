/**
 * Results are stored once and never change, so the concatenated Float32 planes of recently viewed runs are kept
 * in memory: decoding bytea from PostgreSQL on every results-page load cost more than sending the bytes.
 * Least recently used entries go first once the byte budget is spent.
 */
export class RunFieldsCache {
  private readonly entries = new Map<number, { body: Buffer; frames: number }>()
  private bytes = 0
  constructor(private readonly budgetBytes = 64 * 1024 * 1024) {}

  get(runId: number) {
    const e = this.entries.get(runId)
    if (e) {
      this.entries.delete(runId)
      this.entries.set(runId, e)
    }
    return e
  }

  set(runId: number, entry: { body: Buffer; frames: number }) {
    if (entry.body.length > this.budgetBytes) return
    const old = this.entries.get(runId)
    if (old) this.bytes -= old.body.length
    this.entries.delete(runId)
    this.entries.set(runId, entry)
    this.bytes += entry.body.length
    for (const [id, e] of this.entries) {
      if (this.bytes <= this.budgetBytes) break
      this.entries.delete(id)
      this.bytes -= e.body.length
    }
  }
}
