// `npm run bench -- commit`: a bench file of 120,000 Stokes rows (20,000 pieces x 6 inputs) for a
// lot of 20,000 pieces received for the run, previewed and then committed through the API as the
// inspector does. Its limit, in the same run: csv-parse alone on the same text plus a PostgreSQL COPY
// of the same rows into a bare temporary table. Targets: commit under 15 s and <= 3x the limit with
// the server under 400 MB; preview <= 2x the limit.
import { parse } from 'csv-parse/sync';
import pg from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { DEMO_PASSWORD } from '../../db/seeders/demo';
import { CSV_OPTIONS } from '../../shared/optics/csv';
import { STOKES_HEADER } from '../../shared/optics/synthetic';
import { receivedLot } from '../../tests/helpers/receivedLot';
import { stokesFile, upload } from './lib/benchFile';
import { benchUrl } from './lib/database';
import { measured, timed, type Figure } from './lib/figures';
import { api, signIn, waitUntilIdle, type BenchServer } from './lib/server';

const PIECES = 20_000;

/** The same rows, as PostgreSQL's COPY reads them, into a temporary table of the file's columns. */
async function copyRows(text: string) {
  const client = new pg.Client({ connectionString: benchUrl('app') });
  await client.connect();
  try {
    await client.query(
      'CREATE TEMP TABLE bench_rows (serial text, wavelength_nm numeric, input text, s0 float8, s1 float8, s2 float8, s3 float8, mount_deg numeric)',
    );
    const data = text.slice(text.indexOf(STOKES_HEADER));
    return await timed(() => pipeline(Readable.from([data]), client.query(copyFrom('COPY bench_rows FROM STDIN WITH (FORMAT csv, HEADER true)'))));
  } finally {
    await client.end();
  }
}

export async function run({ server, tries }: { server: BenchServer; tries: number }) {
  const token = await signIn(server, 'inspector@phaselot.test', DEMO_PASSWORD);
  let run = 0;
  await measured(
    'commit',
    async (): Promise<Figure[]> => {
      run++;
      const lot = await receivedLot({ quantity: PIECES });
      const text = stokesFile(lot.serials, run);
      const rows = lot.serials.length * 6;
      console.log(
        `commit | lot L-${lot.lotId} of ${PIECES.toLocaleString('en-GB')} pieces received; file of ${rows.toLocaleString('en-GB')} rows, ${(Buffer.byteLength(text) / 1024 / 1024).toFixed(1)} MiB`,
      );

      const parsing = await timed(() => parse(text, CSV_OPTIONS));
      const copying = await copyRows(text);
      const limit = {
        name: `csv-parse alone (${parsing.ms.toFixed(0)} ms) + COPY into a bare table (${copying.ms.toFixed(0)} ms)`,
        value: parsing.ms + copying.ms,
      };

      const path = `/api/inspection/lots/${lot.lotId}/measurements`;
      // Background work left by what came before (an earlier run's commit queues the supplier's
      // drift check) is let finish, so that the preview and the commit are timed alone.
      await waitUntilIdle(server, 120);
      server.resetPeak();
      const preview = await timed(() => api(server, `${path}/preview`, { token, form: upload(text, 'bench-commit.csv') }));
      const previewPeak = server.memory().peakMb;
      server.resetPeak();
      const commit = await timed(() => api(server, path, { token, form: upload(text, 'bench-commit.csv') }));
      const commitPeak = server.memory().peakMb;
      return [
        { name: `preview of the ${rows.toLocaleString('en-GB')}-row file`, value: preview.ms, unit: 'ms', limit, target: { ratio: 2 } },
        {
          name: 'preview answer (JSON)',
          value: preview.result.bytes / 1024 / 1024,
          unit: 'MB',
          target: null,
          note: `server peak RSS during the preview ${previewPeak.toFixed(0)} MB`,
        },
        { name: 'commit of the same file', value: commit.ms, unit: 'ms', limit, target: { ratio: 3, max: 15_000 } },
        { name: 'server peak RSS during the commit', value: commitPeak, unit: 'MB', target: { max: 400 } },
      ];
    },
    tries,
  );
}
