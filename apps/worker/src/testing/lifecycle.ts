import { JobLifecycle, JobsStore, OutboxStore, type AfterMesh, type OutboxEntity } from '@psiform/server';

/** An outbox with no rows (jobs added straight to a queue, as the unit specs do); records done/failed marks. */
export class NoOutbox extends OutboxStore {
  marks: string[] = [];
  enqueue = () => Promise.reject(new Error('unused'));
  relayDue = () => Promise.reject(new Error('unused'));
  claimStale = () => Promise.reject(new Error('unused'));
  redrive = () => Promise.reject(new Error('unused'));
  async findById(): Promise<OutboxEntity | null> {
    return null;
  }
  async markDone(id: string) {
    this.marks.push(`done:${id}`);
  }
  async markFailed(id: string, error: string) {
    this.marks.push(`failed:${id}:${error}`);
  }
}

/** Jobs the specs never touch the rows of. */
export class NoJobs extends JobsStore {
  request = () => Promise.reject(new Error('unused'));
  staleQueued = () => Promise.reject(new Error('unused'));
  redriveQueued = () => Promise.reject(new Error('unused'));
  findById = () => Promise.reject(new Error('unused'));
  loadContext = () => Promise.reject(new Error('unused'));
  markActive = () => Promise.reject(new Error('unused'));
  setStage = () => Promise.reject(new Error('unused'));
  requeue = () => Promise.reject(new Error('unused'));
  fail = () => Promise.reject(new Error('unused'));
  complete = () => Promise.reject(new Error('unused'));
}

/** The runner's own lifecycle over fake stores: handlers are unit-tested through exactly the code the runner uses. */
export function lifecycle(jobs: JobsStore = new NoJobs(), outbox: OutboxStore = new NoOutbox(), afterMesh?: AfterMesh): JobLifecycle {
  return new JobLifecycle(jobs, outbox, afterMesh);
}
