/**
 * The job lifecycle inside one server: a stopping server asks its jobs to stop and waits for them (drain); a study
 * run stops at its next step and fails with the reason, storing no partial results; a job that ignores the request
 * makes the drain time out, and only this process's unfinished jobs are then marked failed.
 */
import request from 'supertest';
import { generatedPlant } from '../../server/bench/study';
import { LabelBatch, StudyRun } from '../../server/db/models';
import { failInterruptedJobs, failOwnJobs, Jobs, JobStopped, STOPPED_BY_SHUTDOWN } from '../../server/services/jobs';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';
import { draftStudy } from '../helpers/flows';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
}, 60_000);
afterAll(async () => {
  await t.close();
});

const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

describe('Jobs', () => {
  it('drain: a job that checks the stop request ends with JobStopped and the drain reports all done', async () => {
    const jobs = new Jobs();
    let seen: unknown = null;
    jobs.start(async () => {
      try {
        for (;;) {
          jobs.throwIfStopping('study-run');
          await sleep(5);
        }
      } catch (e) {
        seen = e;
      }
    });
    await sleep(20);
    expect(jobs.size).toBe(1);
    expect(await jobs.drain(5_000)).toBe(true);
    expect(seen).toBeInstanceOf(JobStopped);
    expect((seen as Error).message).toBe(STOPPED_BY_SHUTDOWN['study-run']);
    expect(jobs.size).toBe(0);
  });

  it('drain: a job that does not stop in time makes the drain answer false and stays listed', async () => {
    const jobs = new Jobs();
    jobs.start(() => sleep(400), { kind: 'label-batch', id: 'b-1' });
    expect(await jobs.drain(50)).toBe(false);
    expect(jobs.refs).toEqual([{ kind: 'label-batch', id: 'b-1' }]);
    await jobs.idle();
    expect(jobs.refs).toEqual([]);
  });
});

describe('a study run when the server stops', () => {
  it('fails at its next step with the reason, no results, and the drain completes', async () => {
    const eng = bearer(t.orgA.users.engineer.token);
    // 1 + 30 + 30 × 99 = 3001 buses: seconds of work, stopped long before the end.
    const studyId = await draftStudy(t, 'Shutdown yard', 'Stopped run', generatedPlant(30, 99));
    const run = await request(t.app)
      .post(`/api/studies/${studyId}/run`)
      .set(...eng);
    expect(run.status).toBe(202);
    expect(await t.ctx.jobs.drain(60_000)).toBe(true);
    const after = await request(t.app)
      .get(`/api/studies/${studyId}/run`)
      .set(...eng);
    expect(after.body.status).toBe('failed');
    expect(after.body.message).toBe(STOPPED_BY_SHUTDOWN['study-run']);
    expect((await StudyRun.findByPk(run.body.id as string))?.results ?? null).toBeNull();
    expect(
      (
        await request(t.app)
          .get(`/api/studies/${studyId}/results`)
          .set(...eng)
      ).status,
    ).toBe(404);
  }, 120_000);
});

describe('unfinished jobs in the database', () => {
  it('at start: every queued or running run and batch is failed with the restart reason; others are untouched', async () => {
    const org = t.orgA.id;
    const by = t.orgA.users.electrician.id;
    const mk = (id: string, status: 'queued' | 'running' | 'done' | 'failed') =>
      LabelBatch.create({ id, organizationId: org, requestedById: by, labelIds: '[]', size: '4x6', status });
    await mk('batch-queued', 'queued');
    await mk('batch-running', 'running');
    await mk('batch-done', 'done');
    const counts = await failInterruptedJobs(new Date());
    expect(counts.batches).toBe(2);
    for (const id of ['batch-queued', 'batch-running']) {
      const b = await LabelBatch.findByPk(id);
      expect(b?.status).toBe('failed');
      expect(b?.message).toMatch(/Interrupted by a server restart; make the print batch again/);
    }
    expect((await LabelBatch.findByPk('batch-done'))?.status).toBe('done');
  });

  it("at a timed-out shutdown: only this process's unfinished jobs are failed", async () => {
    const org = t.orgA.id;
    const by = t.orgA.users.electrician.id;
    await LabelBatch.create({
      id: 'mine',
      organizationId: org,
      requestedById: by,
      labelIds: '[]',
      size: '4x6',
      status: 'running',
    });
    await LabelBatch.create({
      id: 'other-server',
      organizationId: org,
      requestedById: by,
      labelIds: '[]',
      size: '4x6',
      status: 'running',
    });
    const jobs = new Jobs();
    jobs.start(() => sleep(200), { kind: 'label-batch', id: 'mine' });
    expect(await failOwnJobs(jobs, new Date())).toBe(1);
    expect((await LabelBatch.findByPk('mine'))?.status).toBe('failed');
    expect((await LabelBatch.findByPk('mine'))?.message).toBe(STOPPED_BY_SHUTDOWN['label-batch']);
    expect((await LabelBatch.findByPk('other-server'))?.status).toBe('running');
    await jobs.idle();
  });
});
