// Run by backup.test.ts in a process of its own, pointed (by DATABASE_URL, UPLOAD_DIR...) at a
// restored database and file store: the application as users meet it, asked whether the restored
// audit chain and a restored certificate still verify. Prints one JSON line.
import { createHash } from 'node:crypto';
import request from 'supertest';
import { app, as } from '../helpers/api';
import { binaryParser } from '../helpers/zip';

const [number, dataHash] = process.argv.slice(2);
const auditor = await as('auditor');
const chain = await auditor.get('/api/audit/verify');
const certificate = await request(app).get('/api/certificates/verify').query({ number, hash: dataHash });
const pdf = await auditor.get(`/api/documents/${number}.pdf`).buffer(true).parse(binaryParser);
process.stdout.write(
  `${JSON.stringify({
    chain: { status: chain.status, ...chain.body },
    certificate: { status: certificate.status, ...certificate.body },
    pdf: {
      status: pdf.status,
      sha256:
        pdf.status === 200
          ? createHash('sha256')
              .update(pdf.body as Buffer)
              .digest('hex')
          : null,
    },
  })}\n`,
);
process.exit(0);
