// Two server processes on one database, one object store (an S3 fake) and one mail relay serve the
// same users: a session opened on one works on the other, a bench file committed through one is
// stored where both read it, a rejection mails the buyer exactly once, both serve the same
// certificate, and an export whose process is killed in the middle is finished by the other, with
// one file for the job and the retry recorded by the queue.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { spawn, type ChildProcess } from 'node:child_process';
import { createServer, request as httpRequest, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createInterface } from 'node:readline';
import { GetObjectCommand, ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { demoLogin } from '../../db/seeders/demo';
import { stokesBenchFile } from '../../db/seeders/benchFiles';
import { startMailCatcher, type MailCatcher } from '../../server/mail/catcher';
import { readCaughtMail } from '../../server/mail/caughtMail';
import { blobStore, sha256 } from '../../server/storage/blobs';
import { isBlobKey } from '../../server/storage/store';
import { receivedLot } from '../helpers/receivedLot';
import { S3_FAKE_CREDENTIALS, startS3Fake, type S3Fake } from '../helpers/s3fake';
import type { Role } from '../../shared/schemas/roles';

const root = resolve(import.meta.dirname, '../..');
const TODAY = new Date().toISOString().slice(0, 10);
const until = async <T>(what: string, probe: () => Promise<T | undefined | null | false>, tries = 600): Promise<T> => {
  for (let i = 0; i < tries; i++) {
    const value = await probe();
    if (value) return value;
    await new Promise((wait) => setTimeout(wait, 100));
  }
  throw new Error(`gave up waiting for ${what}`);
};

/** A pass-through to the S3 fake that can hold back object reads, to catch a job in the middle. */
function gatedProxy(target: string) {
  const upstream = new URL(target);
  let holding = false;
  const held: (() => void)[] = [];
  const server: Server = createServer((req, res) => {
    const forward = () => {
      const out = httpRequest({ host: upstream.hostname, port: upstream.port, method: req.method, path: req.url, headers: req.headers }, (answer) => {
        res.writeHead(answer.statusCode!, answer.headers);
        answer.pipe(res);
      });
      out.on('error', () => res.destroy());
      req.pipe(out);
    };
    // An object read is GET /bucket/…/key; listing the bucket has no key.
    const objectRead = req.method === 'GET' && (req.url ?? '').split('?')[0].split('/').length > 3;
    if (holding && objectRead) held.push(forward);
    else forward();
  });
  return {
    listen: () => new Promise<string>((done) => server.listen(0, '127.0.0.1', () => done(`http://127.0.0.1:${(server.address() as AddressInfo).port}`))),
    hold: () => void (holding = true),
    held: () => held.length,
    release: () => {
      holding = false;
      held.splice(0).forEach((forward) => forward());
    },
    close: () => new Promise<void>((done) => server.close(() => done())),
  };
}

type Phaselot = { name: string; url: string; child: ChildProcess; logs: { msg: string; [key: string]: unknown }[]; exited: Promise<number | null> };

const freePort = () =>
  new Promise<number>((done) => {
    const probe = createServer().listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as AddressInfo;
      probe.close(() => done(port));
    });
  });

async function startPhaselot(name: string, env: Record<string, string>): Promise<Phaselot> {
  const port = await freePort();
  // node itself with tsx as its loader, so the process killed below is the server and not a wrapper.
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
    cwd: root,
    env: { ...process.env, ...env, PORT: String(port), HOST: '127.0.0.1' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const logs: Phaselot['logs'] = [];
  createInterface({ input: child.stdout! }).on('line', (line) => {
    try {
      logs.push(JSON.parse(line));
    } catch {
      logs.push({ msg: line });
    }
  });
  child.stderr!.on('data', (chunk: Buffer) => logs.push({ msg: chunk.toString() }));
  const exited = new Promise<number | null>((done) => child.on('exit', (code) => done(code)));
  const url = `http://127.0.0.1:${port}`;
  await until(`${name} to answer`, async () => {
    if (child.exitCode !== null) throw new Error(`${name} exited: ${logs.map((l) => l.msg).join('\n')}`);
    return (
      (
        await request(url)
          .get('/api/health')
          .catch(() => null)
      )?.status === 200
    );
  });
  await until(`${name} to work jobs`, async () => logs.some((l) => l.msg.startsWith('Phaselot listening')));
  return { name, url, child, logs, exited };
}

let s3: S3Fake;
let proxy: ReturnType<typeof gatedProxy>;
let catcher: MailCatcher;
let one: Phaselot;
let two: Phaselot;
const s3Client = () => new S3Client({ region: 'us-east-1', endpoint: s3.endpoint, forcePathStyle: true, credentials: S3_FAKE_CREDENTIALS });

beforeAll(async () => {
  s3 = await startS3Fake('phaselot-faults');
  proxy = gatedProxy(s3.endpoint);
  const endpoint = await proxy.listen();
  catcher = await startMailCatcher({ port: 0, dir: mkdtempSync(join(tmpdir(), 'phaselot-faults-mail-')) });
  const env = {
    // Logs on (the test reads them to see which process took the export), the rest as in production.
    NODE_ENV: 'development',
    LOG_LEVEL: 'info',
    STORAGE: 's3',
    S3_ENDPOINT: endpoint,
    S3_BUCKET: s3.bucket,
    S3_ACCESS_KEY_ID: S3_FAKE_CREDENTIALS.accessKeyId,
    S3_SECRET_ACCESS_KEY: S3_FAKE_CREDENTIALS.secretAccessKey,
    SMTP_URL: `smtp://127.0.0.1:${catcher.port}`,
    MAIL_CATCHER_DIR: catcher.dir,
    // A killed export is found dead within seconds rather than the production quarter of an hour.
    EXPORT_TIMEOUT_SECONDS: '5',
    JOBS_MAINTENANCE_SECONDS: '1',
  };
  [one, two] = await Promise.all([startPhaselot('server one', env), startPhaselot('server two', env)]);
}, 120_000);

afterAll(async () => {
  for (const server of [one, two]) {
    if (server && server.child.exitCode === null && server.child.signalCode === null) {
      server.child.kill('SIGTERM');
      await server.exited;
    }
  }
  // The database is the test run's: the files its new rows name are handed to the run's own file
  // store, so later tests reading them (a month's export, say) find them after the fake is gone.
  if (s3) {
    const bucket = s3Client();
    for (const object of (await bucket.send(new ListObjectsV2Command({ Bucket: s3.bucket }))).Contents ?? []) {
      const key = object.Key!.split('/').pop()!;
      if (!isBlobKey(key) || (await blobStore.has(key))) continue;
      const body = await (await bucket.send(new GetObjectCommand({ Bucket: s3.bucket, Key: object.Key! }))).Body!.transformToByteArray();
      await blobStore.put(key, Buffer.from(body));
    }
    bucket.destroy();
  }
  await proxy?.close();
  await catcher?.close();
  await s3?.close();
});

async function signIn(server: Phaselot, role: Role) {
  const response = await request(server.url).post('/api/auth/login').send(demoLogin(role)).expect(200);
  return `Bearer ${response.body.token as string}`;
}

function benchOf(serials: string[], retardanceWaves: number) {
  return stokesBenchFile(
    serials.map((serial) => ({ serial, wavelengthNm: 632.8, retardanceWaves, fastAxisDeg: 0.05 })),
    {
      instrument: 'BENCH-2',
      date: TODAY,
      noise: 0.0004,
      seed: serials.length,
    },
  );
}

describe('two server processes', () => {
  it('share sessions, files, mail, certificates and jobs, and finish an export whose process was killed', async () => {
    // Signed in on server one; every request below on server two uses that session.
    const inspector = await signIn(one, 'inspector');
    const quality = await signIn(one, 'quality');
    const auditor = await signIn(one, 'auditor');

    // A lot whose sample is far out of tolerance: bench file committed on two, rejected on one.
    const rejected = await receivedLot({ quantity: 8 });
    const rejectedView = await request(two.url).get(`/api/inspection/lots/${rejected.lotId}`).set('Authorization', inspector).expect(200);
    const rejectedSample = (rejectedView.body.pieces as { serial: string; inSample: boolean }[]).filter((p) => p.inSample).map((p) => p.serial);
    const badFile = benchOf(rejectedSample, 0.256);
    await request(two.url)
      .post(`/api/inspection/lots/${rejected.lotId}/measurements`)
      .set('Authorization', inspector)
      .attach('files', Buffer.from(badFile), { filename: 'bench.csv', contentType: 'text/csv' })
      .expect(201);
    await request(one.url)
      .post(`/api/inspection/lots/${rejected.lotId}/dispositions`)
      .set('Authorization', quality)
      .send({
        decision: 'reject',
        password: 'phaselot-demo',
        meaningAcknowledged: true,
        expectedDispositionId: null,
        justification: 'Retardance far out of tolerance',
      })
      .expect(201);

    // A lot within tolerance: measured through one, accepted through two, its certificate served by both.
    const accepted = await receivedLot({ quantity: 8 });
    const acceptedView = await request(one.url).get(`/api/inspection/lots/${accepted.lotId}`).set('Authorization', inspector).expect(200);
    const acceptedSample = (acceptedView.body.pieces as { serial: string; inSample: boolean }[]).filter((p) => p.inSample).map((p) => p.serial);
    await request(one.url)
      .post(`/api/inspection/lots/${accepted.lotId}/measurements`)
      .set('Authorization', inspector)
      .attach('files', Buffer.from(benchOf(acceptedSample, 0.2501)), { filename: 'bench.csv', contentType: 'text/csv' })
      .expect(201);
    const signed = await request(two.url)
      .post(`/api/inspection/lots/${accepted.lotId}/dispositions`)
      .set('Authorization', quality)
      .send({ decision: 'accept', password: 'phaselot-demo', meaningAcknowledged: true, expectedDispositionId: null })
      .expect(201);
    const certificate = (signed.body.documents as { number: string; kind: string }[]).find((d) => d.kind === 'certificate')!;
    const [{ pdf_sha256: pdfSha256 }] = await sequelize.query<{ pdf_sha256: string }>('SELECT pdf_sha256 FROM lot_documents WHERE number = :number', {
      type: QueryTypes.SELECT,
      replacements: { number: certificate.number },
    });
    const served = await Promise.all(
      [one, two].map(async (server) => {
        const response = await request(server.url)
          .get(`/api/documents/${certificate.number}.pdf`)
          .set('Authorization', auditor)
          .buffer(true)
          .parse((res, done) => {
            const chunks: Buffer[] = [];
            res.on('data', (chunk: Buffer) => chunks.push(chunk));
            res.on('end', () => done(null, Buffer.concat(chunks)));
          })
          .expect(200);
        return response.body as Buffer;
      }),
    );
    expect(sha256(served[0])).toBe(pdfSha256);
    expect(served[1].equals(served[0])).toBe(true);

    // The bench file committed through server two is in the shared bucket, under its SHA-256.
    const bucket = s3Client();
    const badKey = sha256(badFile);
    const stored = await bucket.send(new GetObjectCommand({ Bucket: s3.bucket, Key: `${badKey.slice(0, 2)}/${badKey}` }));
    expect(await stored.Body!.transformToString()).toBe(badFile);

    // Exactly one mail for the rejection, though both processes work the mail queue.
    const supplierLot = `SL-${rejected.poNumber.replace('PO-T-', '')}`;
    const rejectionMail = async () => (await readCaughtMail(catcher.dir)).filter((m) => m.subject.includes(`supplier lot ${supplierLot} `));
    await until('the rejection mail', async () => (await rejectionMail()).length > 0);

    // An export caught in the middle: its PDF reads are held back, the process building it killed.
    proxy.hold();
    const started = await request(one.url)
      .post('/api/exports')
      .set('Authorization', auditor)
      .send({ from: TODAY, to: TODAY, supplierId: accepted.supplierId })
      .expect(202);
    const exportId = started.body.id as number;
    const builder = await until('a process to start the export', async () =>
      [one, two].find((server) => server.logs.some((l) => l.msg === 'export build started' && l.exportJob === exportId)),
    );
    await until('the export to wait for a PDF', async () => proxy.held() > 0);
    builder.child.kill('SIGKILL');
    await builder.exited;
    proxy.release();
    const survivor = builder === one ? two : one;

    const finished = await until(
      'the export to be finished by the other process',
      async () => {
        const job = (await request(survivor.url).get(`/api/exports/${exportId}`).set('Authorization', auditor).expect(200)).body;
        return job.status === 'done' || job.status === 'failed' ? job : null;
      },
      900,
    );
    expect(finished).toMatchObject({ status: 'done', error: null });
    expect(survivor.logs.some((l) => l.msg === 'export build started' && l.exportJob === exportId && l.attempt === 1)).toBe(true);

    // The queue's own record: completed on the second try (one retry after the killed one).
    const [{ queue_job_id: queueJobId, attempt }] = await sequelize.query<{ queue_job_id: string; attempt: number }>(
      'SELECT queue_job_id, attempt FROM export_jobs WHERE id = :id',
      {
        type: QueryTypes.SELECT,
        replacements: { id: exportId },
      },
    );
    expect(attempt).toBe(1);
    const [queued] = await sequelize.query<{ state: string; retry_count: number }>(
      `SELECT state, retry_count FROM pgboss.job WHERE id = :id UNION ALL SELECT state, retry_count FROM pgboss.archive WHERE id = :id`,
      { type: QueryTypes.SELECT, replacements: { id: queueJobId } },
    );
    expect(queued).toEqual({ state: 'completed', retry_count: 1 });

    // One export file for the job in the bucket: the ZIP the job records, and no other.
    const download = await request(survivor.url)
      .get(`/api/exports/${exportId}/download`)
      .set('Authorization', auditor)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect(sha256(download.body as Buffer)).toBe(finished.sha256);
    const listing = await bucket.send(new ListObjectsV2Command({ Bucket: s3.bucket }));
    const zips = [];
    for (const object of listing.Contents ?? []) {
      const body = await (await bucket.send(new GetObjectCommand({ Bucket: s3.bucket, Key: object.Key! }))).Body!.transformToByteArray();
      if (Buffer.from(body.slice(0, 4)).equals(Buffer.from('PK\x03\x04', 'binary'))) zips.push(object.Key!.split('/').pop());
    }
    expect(zips).toEqual([finished.sha256]);
    bucket.destroy();

    // Still exactly one rejection mail after all the background work of both processes.
    expect(await rejectionMail()).toHaveLength(1);
  }, 180_000);
});
