// `npm run bench -- fill [--force]`: the database of a site with years of records, in the bench
// cluster's own database: the demo scenario (users, instruments, locations, a few lots taken
// through the real operations, whose stored files the filled records point at), then the history
// of fillModel.ts: 100,000 lots, 1 million pieces, 2 million readings, 2.3 million stock moves and
// their audit trail. The migrations run first, as the owner role, which also writes the rows.
//
// Rows are multiplied inside PostgreSQL (INSERT ... SELECT over generate_series) from one staging
// row per lot, in chunks of lots so the progress bar moves. The tables' triggers stay on: stock
// moves go in per piece in the order they happened (receipt, decision, transfer, issue), so each
// starts where the piece is, and audit events go in in time order, each chained by the trigger.
// A finished fill is written on the database's comment; a second fill refuses, --force rebuilds.
import { SingleBar } from 'cli-progress';
import { rmSync } from 'node:fs';
import { join } from 'node:path';
import type pg from 'pg';
import { SIGNATURE_MEANINGS } from '../../shared/inspection/lotVerdict';
import type { PartSpec } from '../../shared/schemas/spec';
import { benchDir, ensureBenchDatabase, fillRecord, withBenchClient } from './lib/database';
import { timed } from './lib/figures';
import { ORDERS, SCALE, aqlOfPart, readingTemplates, simulateHistory, type FillLot } from './fillModel';

const CHUNK = 2_000;
// Each event moves the chain's single head row, leaving a dead row version behind; the trigger reads
// the head by scanning its table, so small transactions and a vacuum now and then keep that table
// to a page or two instead of thousands.
const AUDIT_BATCH = 250;
const VACUUM_HEAD_EVERY = 40;

type Ids = Record<
  | 'suppliers'
  | 'parts'
  | 'purchase_orders'
  | 'purchase_order_lines'
  | 'shipments'
  | 'lots'
  | 'pieces'
  | 'lot_inspections'
  | 'measurement_files'
  | 'dispositions',
  number
>;
type Context = {
  client: pg.Client;
  bar: SingleBar;
  users: Record<'clerk' | 'inspector' | 'quality' | 'buyer', number>;
  locations: Record<'quarantine' | 'stock' | 'stock2' | 'stock3' | 'review' | 'vendor', number>;
};

export async function fill(options: { force: boolean }) {
  await ensureBenchDatabase({ recreate: options.force });
  if (!options.force) {
    const done = await fillRecord();
    if (done) throw new FillRefused(`The bench database is filled already (${done}). Run \`npm run bench -- fill --force\` to build it again.`);
    const used = await withBenchClient(async (c) => (await c.query("SELECT to_regclass('public.users') IS NOT NULL AS used")).rows[0].used as boolean);
    if (used) throw new FillRefused('The bench database holds an unfinished fill. Run `npm run bench -- fill --force` to build it again.');
  }
  rmSync(join(benchDir, 'uploads'), { recursive: true, force: true });
  const started = performance.now();

  // Imported only now: they read the bench database's settings, which the caller has set.
  const { migrate } = await import('../../db/migrator');
  const { seedDemo } = await import('../../db/seeders/demo');
  const { verifyAuditChain } = await import('../../server/audit/verify');
  await migrate();
  await seedDemo();
  console.log(`fill: schema migrated and demo scenario seeded (${((performance.now() - started) / 1000).toFixed(0)} s)`);

  console.log(`fill: history of ${describeScale()}`);
  const history = simulateHistory();
  const totals = countRows(history.lots);
  await withBenchClient(async (client) => {
    const bar = new SingleBar({
      format: 'fill [{bar}] {percentage}% | {value}/{total} rows | {step} | {duration_formatted} (ETA {eta_formatted})',
      hideCursor: true,
      etaBuffer: 200,
      noTTYOutput: true,
      notTTYSchedule: 10_000,
    });
    const context = await contextOf(client, bar);
    bar.start(totals.all, 0, { step: 'staging' });
    const { specs, ids } = await stage(context, history);
    for (const [name, step] of steps(ids, specs)) {
      bar.update({ step: name });
      await step(context);
    }
    bar.update({ step: 'sequences, vacuum and statistics' });
    await finish(client, ids);
    bar.stop();
  });
  const seconds = (performance.now() - started) / 1000;
  const counts = await withBenchClient(async (client) => {
    const { rows } = await client.query<Record<string, string>>(`SELECT
      (SELECT count(*) FROM lots) AS lots, (SELECT count(*) FROM pieces) AS pieces, (SELECT count(*) FROM readings) AS readings,
      (SELECT count(*) FROM stock_moves) AS moves, (SELECT count(*) FROM audit_events) AS audit, pg_size_pretty(pg_database_size(current_database())) AS size`);
    const c = rows[0];
    const note = `phaselot bench fill, ${new Date().toISOString().slice(0, 10)}: ${c.lots} lots, ${c.pieces} pieces, ${c.readings} readings, ${c.moves} stock moves, ${c.audit} audit events, ${c.size}`;
    await client.query(`COMMENT ON DATABASE "${client.database}" IS ${client.escapeLiteral(note)}`);
    return note;
  });
  console.log(`fill: done in ${(seconds / 60).toFixed(1)} min: ${counts.replace(/^phaselot bench fill, [\d-]+: /, '')}`);

  const verified = await timed(() => verifyAuditChain());
  const report = verified.result;
  console.log(
    `fill: audit chain verified in ${(verified.ms / 1000).toFixed(1)} s (the check GET /api/audit/verify runs): ${report.checked} events, ` +
      (report.intact ? 'intact' : `${report.problems.length} problem(s), first: ${JSON.stringify(report.problems[0])}`),
  );
}

export class FillRefused extends Error {}

async function contextOf(client: pg.Client, bar: SingleBar): Promise<Context> {
  const user = async (email: string) => (await client.query<{ id: number }>('SELECT id FROM users WHERE email = $1', [email])).rows[0].id;
  const location = async (code: string) => (await client.query<{ id: number }>('SELECT id FROM locations WHERE code = $1', [code])).rows[0].id;
  return {
    client,
    bar,
    users: {
      clerk: await user('clerk@phaselot.test'),
      inspector: await user('inspector@phaselot.test'),
      quality: await user('quality@phaselot.test'),
      buyer: await user('buyer@phaselot.test'),
    },
    locations: {
      quarantine: await location('QUARANTINE'),
      stock: await location('BIN-A1'),
      stock2: await location('BIN-A2'),
      stock3: await location('BIN-B1'),
      review: await location('MRB'),
      vendor: await location('RTV'),
    },
  };
}

/** What the progress bar counts: the rows of the big tables, as the model will make them. */
function countRows(lots: FillLot[]) {
  let pieces = 0;
  let measured = 0;
  let decided = 0;
  for (const lot of lots) {
    pieces += lot.quantity;
    measured += lot.state === 'sorted' ? lot.quantity : lot.measured;
    if (lot.decision) decided++;
  }
  // receipts + one move per decided piece + transfers and issues (about a third of stocked pieces)
  const moves = Math.round(pieces + pieces * (decided / lots.length) * 1.33);
  // receipt, upload, decision, stock moves and issues: about 7.7 events a lot
  const audit = Math.round(lots.length * 7.7);
  // staging, shipment, lot, plan, file, decision and documents: about 7 rows a lot; sample, readings and result: 8 a measured piece
  return { all: lots.length * 7 + pieces + measured * 8 + moves + audit };
}

/** The demo's tables' highest ids, so filled rows take the ids after them (set explicitly, so pieces
 * and readings can be numbered arithmetically), and the staging tables of the history. */
async function stage(context: Context, history: ReturnType<typeof simulateHistory>) {
  const { client } = context;
  const base = {} as Ids;
  for (const table of [
    'suppliers',
    'parts',
    'purchase_orders',
    'purchase_order_lines',
    'shipments',
    'lots',
    'pieces',
    'lot_inspections',
    'measurement_files',
    'dispositions',
  ] as const) {
    base[table] = Number((await client.query(`SELECT coalesce(max(id), 0) AS id FROM ${table}`)).rows[0].id);
  }
  // Filled parts take the demo's single-wavelength specifications in turn.
  const specs = (await client.query<{ spec: PartSpec }>("SELECT spec FROM parts WHERE spec->>'construction' <> 'achromatic' ORDER BY id")).rows.map(
    (p) => p.spec,
  );
  const [instrument] = (
    await client.query(
      'SELECT uncertainty_waves::float8 AS "uncertaintyWaves", uncertainty_deg::float8 AS "uncertaintyDeg", s3_sign AS "s3Sign", angle_sign AS "angleSign" FROM instruments WHERE code = \'BENCH-2\'',
    )
  ).rows;
  const templates = readingTemplates(specs, instrument);

  await client.query(`
    CREATE TEMP TABLE fill_template (spec int, verdict text, variant int, wavelength numeric, fields jsonb, result jsonb, PRIMARY KEY (spec, verdict, variant));
    CREATE TEMP TABLE fill_raw (
      n int PRIMARY KEY, ord int, line int, line_number int, supplier int, part int, quantity int, first_piece int, received_at timestamptz,
      state text, aql numeric, severity text, code_letter text, plan_letter text, sample_size int, accept int, reject int, hundred boolean,
      seed text, sample int[], measured int, defectives int, decision text, signed_at timestamptz, doc_serial int, cert_serial int,
      sw_position int, sw_before jsonb, sw_after jsonb, sw_explanation text, sw_changed boolean);
  `);
  for (const [s, t] of templates.entries()) {
    for (const [verdict, list] of [
      ['pass', t.pass],
      ['fail', t.fail],
    ] as const) {
      for (const [variant, template] of list.entries()) {
        await client.query('INSERT INTO fill_template VALUES ($1, $2, $3, $4, $5, $6)', [
          s,
          verdict,
          variant,
          specs[s].designWavelengthNm,
          JSON.stringify(template.fields),
          JSON.stringify(template.result),
        ]);
      }
    }
  }

  // Document numbers continue the demo's: one per decision (the report, and the certificate of an
  // accepted lot), and one more for the certificate that completes a sort.
  let serial = Number((await client.query('SELECT last_value FROM certificate_numbers')).rows[0].last_value);
  const docSerial = history.lots.map((lot) => (lot.decision ? ++serial : null));
  const certSerial = history.lots.map((lot) => (lot.state === 'sorted' && lot.quantity > lot.sampleSize ? ++serial : null));
  for (let from = 0; from < history.lots.length; from += 10_000) {
    const rows = history.lots.slice(from, from + 10_000);
    const column = <T>(value: (lot: FillLot, index: number) => T) => rows.map((lot, i) => value(lot, from + i));
    await client.query(
      `INSERT INTO fill_raw SELECT n, ord, line, line_number, supplier, part, quantity, first_piece, received_at, state, aql, severity, code_letter, plan_letter,
              sample_size, accept, reject, hundred, seed, sample::int[], measured, defectives, decision, signed_at, doc_serial, cert_serial, sw_position,
              sw_before::jsonb, sw_after::jsonb, sw_explanation, sw_changed
         FROM unnest($1::int[], $2::int[], $3::int[], $4::int[], $5::int[], $6::int[], $7::int[], $8::int[], $9::timestamptz[], $10::text[], $11::numeric[],
                     $12::text[], $13::text[], $14::text[], $15::int[], $16::int[], $17::int[], $18::boolean[], $19::text[], $20::text[], $21::int[], $22::int[],
                     $23::text[], $24::timestamptz[], $25::int[], $26::int[], $27::int[], $28::text[], $29::text[], $30::text[], $31::boolean[])
           AS raw(n, ord, line, line_number, supplier, part, quantity, first_piece, received_at, state, aql, severity, code_letter, plan_letter, sample_size, accept,
                  reject, hundred, seed, sample, measured, defectives, decision, signed_at, doc_serial, cert_serial, sw_position, sw_before, sw_after, sw_explanation, sw_changed)`,
      [
        column((l) => l.n),
        column((l) => l.order),
        column((l) => l.line),
        column((l) => l.lineNumber),
        column((l) => l.supplier),
        column((l) => l.part),
        column((l) => l.quantity),
        column((l) => l.firstPiece),
        column((l) => l.receivedAt),
        column((l) => l.state),
        column((l) => l.aql),
        column((l) => l.severity),
        column((l) => l.codeLetter),
        column((l) => l.planLetter),
        column((l) => l.sampleSize),
        column((l) => l.accept),
        column((l) => l.reject),
        column((l) => l.hundredPercent),
        column((l) => l.seed),
        column((l) => `{${l.sample.join(',')}}`),
        column((l) => l.measured),
        column((l) => l.defectives),
        column((l) => l.decision),
        column((l) => l.signedAt),
        column((_l, i) => docSerial[i]),
        column((_l, i) => certSerial[i]),
        column((l) => l.switching?.position ?? null),
        column((l) => (l.switching ? JSON.stringify(l.switching.before) : null)),
        column((l) => (l.switching ? JSON.stringify(l.switching.after) : null)),
        column((l) => l.switching?.explanation ?? null),
        column((l) => l.switching?.changed ?? null),
      ],
    );
    context.bar.increment(rows.length);
  }

  // Every id of a lot's rows follows from its number n and the demo's highest ids.
  await client.query(`
    CREATE TEMP TABLE fill_lot AS
    SELECT r.*,
           ${base.lots} + n + 1 AS lot_id, ${base.shipments} + n + 1 AS shipment_id, ${base.lot_inspections} + n + 1 AS inspection_id,
           ${base.purchase_orders} + ord + 1 AS po_id, ${base.purchase_order_lines} + line + 1 AS line_id,
           ${base.suppliers} + supplier + 1 AS supplier_id, ${base.parts} + part + 1 AS part_id, part % ${specs.length} AS spec,
           ${base.pieces} + first_piece + 1 AS first_piece_id,
           CASE WHEN state <> 'quarantine' THEN ${base.measurement_files} + 2 * n + 1 END AS file_id,
           CASE WHEN state = 'sorted' AND quantity > sample_size THEN ${base.measurement_files} + 2 * n + 2 END AS sort_file_id,
           CASE WHEN decision IS NOT NULL THEN ${base.dispositions} + n + 1 END AS disposition_id,
           received_at + interval '20 hours' AS measured_at,
           CASE WHEN state = 'sorted' THEN signed_at + interval '2 days' END AS sorted_at
      FROM fill_raw r;
    CREATE UNIQUE INDEX ON fill_lot (n);
    ANALYZE fill_lot;

    -- Each piece, with its verdict (the first 'defectives' of the measured sample fail; a sort measures
    -- the rest too) and where it goes: the decision's destination, then perhaps a transfer and an issue.
    CREATE TEMP VIEW fill_piece AS
    SELECT l.*, i, l.first_piece_id + i AS piece_id, 'F' || lpad((l.n + 1)::text, 6, '0') || '-' || lpad((i + 1)::text, 2, '0') AS serial, f.pos, f.verdict,
           f.dest, f.dest = 'stock' AND f.luck < 4 AS transferred, f.dest = 'stock' AND f.luck BETWEEN 10 AND 41 AS issued, f.luck
      FROM fill_lot l CROSS JOIN LATERAL generate_series(0, l.quantity - 1) AS i
      CROSS JOIN LATERAL (SELECT array_position(l.sample, i) AS pos, ((l.n::bigint * 7919 + i * 104729) % 100)::int AS luck) p
      CROSS JOIN LATERAL (SELECT
        CASE WHEN p.pos <= l.measured THEN CASE WHEN p.pos <= l.defectives THEN 'fail' ELSE 'pass' END
             WHEN l.state = 'sorted' AND p.pos IS NULL THEN CASE WHEN (i * 7 + l.n) % 10 = 0 THEN 'fail' ELSE 'pass' END END AS verdict) v
      CROSS JOIN LATERAL (SELECT p.pos, v.verdict, p.luck,
        CASE l.state WHEN 'accepted' THEN CASE WHEN v.verdict = 'fail' THEN 'review' ELSE 'stock' END
                     WHEN 'rejected' THEN 'vendor'
                     WHEN 'sorted' THEN CASE WHEN v.verdict = 'pass' THEN 'stock' ELSE 'vendor' END END AS dest) f;
  `);
  return { specs, ids: base };
}

type Step = [string, (context: Context) => Promise<void>];

/** Runs `sql` (with $1, $2 = a chunk's first and past-last lot number) over every chunk of lots. */
function byChunks(sql: string): (context: Context) => Promise<void> {
  return async ({ client, bar }) => {
    for (let from = 0; from < SCALE.lots; from += CHUNK) {
      const result = await client.query(sql, [from, from + CHUNK]);
      bar.increment(result.rowCount ?? 0);
    }
  };
}

function steps(base: Ids, specs: PartSpec[]): Step[] {
  const q = (value: string) => `'${value.replaceAll("'", "''")}'`;
  const verdictJson = `jsonb_build_object('measured', l.sample_size, 'proposal', CASE l.decision WHEN 'accept' THEN 'accept' ELSE 'reject' END, 'defectives', l.defectives,
      'incomplete', '[]'::jsonb, 'unmeasured', '[]'::jsonb,
      'explanation', CASE l.decision WHEN 'accept' THEN l.defectives || ' defective(s) in the sample, within Ac ' || l.accept ELSE l.defectives || ' defective(s) in the sample reach Re ' || l.reject END)`;
  const lotName = `'L-' || l.lot_id`;
  const docNumber = (prefix: string, serial: string, at: string) => `'${prefix}-' || extract(year FROM ${at})::int || '-' || lpad(${serial}::text, 5, '0')`;
  return [
    [
      'suppliers and parts',
      async ({ client, bar, users }) => {
        const suppliers = await client.query(
          `INSERT INTO suppliers (id, name, contact_email, owner_id, notes, created_at, updated_at)
         SELECT ${base.suppliers} + s + 1, 'Fill supplier ' || lpad((s + 1)::text, 2, '0'), 'orders@supplier-' || lpad((s + 1)::text, 2, '0') || '.fill.example', $1,
                'Invented supplier of the benchmark fill.', $2, $2
           FROM generate_series(0, ${SCALE.suppliers - 1}) s`,
          [users.buyer, new Date(SCALE.first - 60 * 86_400_000)],
        );
        const parts = await client.query(
          `INSERT INTO parts (id, number, description, spec, created_at, updated_at)
         SELECT ${base.parts} + p + 1, 'FILL-' || lpad((p + 1)::text, 3, '0'), (ARRAY[${specs.map((s) => q(`${s.nominalWaves === 0.5 ? 'Half' : 'Quarter'}-wave plate, ${s.designWavelengthNm} nm (fill)`)).join(', ')}])[p % ${specs.length} + 1],
                (ARRAY[${specs.map((s) => `${q(JSON.stringify(s))}::jsonb`).join(', ')}])[p % ${specs.length} + 1], $1, $1
           FROM generate_series(0, ${SCALE.parts - 1}) p`,
          [new Date(SCALE.first - 60 * 86_400_000)],
        );
        bar.increment((suppliers.rowCount ?? 0) + (parts.rowCount ?? 0));
      },
    ],
    [
      'purchase orders',
      async ({ client, bar, users }) => {
        const orders = await client.query(
          `INSERT INTO purchase_orders (id, number, supplier_id, buyer_id, ordered_on, currency, status, notes, created_at, updated_at)
         SELECT po_id, 'FPO-' || lpad((ord + 1)::text, 6, '0'), min(supplier_id), $1, (min(received_at) - interval '12 days')::date, 'EUR',
                CASE WHEN bool_and(decision IS NOT NULL) THEN 'closed' ELSE 'open' END, '', min(received_at) - interval '12 days', max(coalesce(signed_at, received_at))
           FROM fill_lot l GROUP BY po_id, ord ORDER BY po_id`,
          [users.buyer],
        );
        const lines = await client.query(
          `INSERT INTO purchase_order_lines (id, purchase_order_id, line_number, part_id, quantity, unit_price, inspection_level, aql, hundred_percent, spec, created_at, updated_at)
         SELECT l.line_id, min(l.po_id), min(l.line_number), min(l.part_id), sum(l.quantity), 40 + (min(l.part) % 9) * 15, 'II', min(l.aql), false, min(p.spec::text)::jsonb,
                min(l.received_at) - interval '12 days', min(l.received_at) - interval '12 days'
           FROM fill_lot l JOIN parts p ON p.id = l.part_id GROUP BY l.line_id ORDER BY l.line_id`,
        );
        bar.increment((orders.rowCount ?? 0) + (lines.rowCount ?? 0));
      },
    ],
    [
      'shipments and lots',
      async ({ client, bar, users }) => {
        const shipments = await client.query(
          `INSERT INTO shipments (id, purchase_order_id, packing_slip, carrier, received_at, received_by, created_at)
         SELECT shipment_id, po_id, 'PS-F' || lpad((n + 1)::text, 6, '0'), (ARRAY['Larchway Freight', 'Pellow Couriers', 'Brindle Air Parcel'])[n % 3 + 1], received_at, $1, received_at
           FROM fill_lot ORDER BY n`,
          [users.clerk],
        );
        const lots = await client.query(
          `INSERT INTO lots (id, shipment_id, po_line_id, part_id, supplier_lot, quantity, state, created_at, updated_at)
         SELECT lot_id, shipment_id, line_id, part_id, 'FSL-' || lpad((n + 1)::text, 6, '0'), quantity, state, received_at, coalesce(sorted_at, signed_at, measured_at, received_at)
           FROM fill_lot ORDER BY n`,
        );
        bar.increment((shipments.rowCount ?? 0) + (lots.rowCount ?? 0));
      },
    ],
    [
      'pieces',
      byChunks(`
      INSERT INTO pieces (id, lot_id, part_id, serial, state, created_at, updated_at)
      SELECT piece_id, lot_id, part_id, serial,
             CASE dest WHEN 'stock' THEN CASE WHEN issued THEN 'issued' ELSE 'in-stock' END WHEN 'review' THEN 'held' WHEN 'vendor' THEN 'returned' ELSE 'quarantine' END,
             received_at, coalesce(sorted_at, signed_at, received_at)
        FROM fill_piece WHERE n >= $1 AND n < $2 ORDER BY piece_id`),
    ],
    [
      'sampling plans and samples',
      async (context) => {
        const plans = await context.client.query(`
        INSERT INTO lot_inspections (id, lot_id, severity, inspection_level, aql, code_letter, plan_letter, sample_size, accept_number, reject_number, hundred_percent, sample_seed, created_at)
        SELECT inspection_id, lot_id, severity, 'II', aql, code_letter, plan_letter, sample_size, accept, reject, hundred, seed, received_at FROM fill_lot ORDER BY n`);
        context.bar.increment(plans.rowCount ?? 0);
        await byChunks(
          `INSERT INTO sample_pieces (inspection_id, piece_id) SELECT inspection_id, piece_id FROM fill_piece WHERE pos IS NOT NULL AND n >= $1 AND n < $2`,
        )(context);
      },
    ],
    [
      'measurement files',
      async ({ client, bar, users }) => {
        const key = (await client.query<{ key: string }>('SELECT storage_key AS key FROM measurement_files ORDER BY id LIMIT 1')).rows[0].key;
        const files = await client.query(
          `INSERT INTO measurement_files (id, lot_id, instrument_id, original_name, sha256, size_bytes, method, metadata, row_count, warnings, storage_key, uploaded_by, uploaded_at)
         SELECT f.id, l.lot_id, (SELECT id FROM instruments WHERE code = 'BENCH-2'), f.name, $1::text, f.rows * 58 + 120, 'stokes',
                jsonb_build_object('date', to_char(f.at, 'YYYY-MM-DD'), 'operator', 'QC-07', 'instrument', 'BENCH-2'), f.rows, '[]', $1::text, $2, f.at
           FROM fill_lot l CROSS JOIN LATERAL (VALUES
             (l.file_id, 'bench-' || ${lotName} || '.csv', l.measured * 6, l.measured_at),
             (l.sort_file_id, 'sort-' || ${lotName} || '.csv', (l.quantity - l.sample_size) * 6, l.signed_at + interval '1 day')) f(id, name, rows, at)
          WHERE f.id IS NOT NULL ORDER BY f.id`,
          [key, users.inspector],
        );
        bar.increment(files.rowCount ?? 0);
      },
    ],
    // A sample piece is line 6 + 6k of its file (after four # lines and the header), k its place in the sample; a sorted piece the same in the sort file.
    [
      'readings',
      byChunks(`
      INSERT INTO readings (file_id, line, serial, wavelength_nm, fields)
      SELECT f.file, 6 + 6 * f.k + j, p.serial, t.wavelength, jsonb_set(t.fields -> j, '{serial}', to_jsonb(p.serial))
        FROM fill_piece p
        CROSS JOIN LATERAL (SELECT CASE WHEN p.pos IS NOT NULL THEN p.file_id ELSE p.sort_file_id END AS file,
                                   CASE WHEN p.pos IS NOT NULL THEN p.pos - 1 ELSE p.i - (SELECT count(*) FROM unnest(p.sample) s WHERE s < p.i)::int END AS k) f
        JOIN fill_template t ON t.spec = p.spec AND t.verdict = p.verdict AND t.variant = (p.n + p.i) % 8
        CROSS JOIN generate_series(0, 5) j
       WHERE p.verdict IS NOT NULL AND p.n >= $1 AND p.n < $2
       ORDER BY f.file, f.k, j`),
    ],
    [
      'piece results',
      byChunks(`
      INSERT INTO piece_results (piece_id, file_id, wavelength_nm, verdict, result, created_at)
      SELECT p.piece_id, f.file, t.wavelength, p.verdict,
             jsonb_set(jsonb_set(t.result, '{serial}', to_jsonb(p.serial)), '{lines}', to_jsonb(ARRAY[6 + 6 * f.k, 7 + 6 * f.k, 8 + 6 * f.k, 9 + 6 * f.k, 10 + 6 * f.k, 11 + 6 * f.k])),
             CASE WHEN p.pos IS NOT NULL THEN p.measured_at ELSE p.signed_at + interval '1 day' END
        FROM fill_piece p
        CROSS JOIN LATERAL (SELECT CASE WHEN p.pos IS NOT NULL THEN p.file_id ELSE p.sort_file_id END AS file,
                                   CASE WHEN p.pos IS NOT NULL THEN p.pos - 1 ELSE p.i - (SELECT count(*) FROM unnest(p.sample) s WHERE s < p.i)::int END AS k) f
        JOIN fill_template t ON t.spec = p.spec AND t.verdict = p.verdict AND t.variant = (p.n + p.i) % 8
       WHERE p.verdict IS NOT NULL AND p.n >= $1 AND p.n < $2
       ORDER BY f.file, f.k`),
    ],
    [
      'dispositions and documents',
      async ({ client, bar, users }) => {
        const dispositions = await client.query(
          `INSERT INTO dispositions (id, lot_id, decision, meaning, deviation_number, justification, lot_verdict, signer_id, signed_at)
         SELECT l.disposition_id, l.lot_id, l.decision,
                CASE l.decision ${Object.entries(SIGNATURE_MEANINGS)
                  .map(([d, m]) => `WHEN ${q(d)} THEN ${q(m)}`)
                  .join(' ')} END, NULL,
                CASE l.decision WHEN 'reject' THEN 'Retardance out of tolerance on sample pieces.'
                                WHEN 'sort' THEN 'Needed for the build: sort at our bench, return the nonconforming plates.' END,
                ${verdictJson}, $1, l.signed_at
           FROM fill_lot l WHERE l.decision IS NOT NULL ORDER BY l.n`,
          [users.quality],
        );
        const blob = async (kind: string) =>
          (await client.query<{ key: string }>('SELECT storage_key AS key FROM lot_documents WHERE kind = $1 ORDER BY id LIMIT 1', [kind])).rows[0].key;
        const documents = await client.query(
          `INSERT INTO lot_documents (lot_id, disposition_id, kind, number, data_hash, pdf_sha256, storage_key, issued_at)
         SELECT l.lot_id, l.disposition_id, d.kind, d.number, encode(sha256(convert_to(d.number, 'UTF8')), 'hex'), d.key, d.key, d.at
           FROM fill_lot l CROSS JOIN LATERAL (VALUES
             ('certificate', CASE WHEN l.decision = 'accept' THEN ${docNumber('PLC', 'l.doc_serial', 'l.signed_at')} END, $1::text, l.signed_at),
             ('inspection-report', ${docNumber('PLR', 'l.doc_serial', 'l.signed_at')}, $2::text, l.signed_at),
             ('certificate', CASE WHEN l.cert_serial IS NOT NULL THEN ${docNumber('PLC', 'l.cert_serial', 'l.sorted_at')} END, $1::text, l.sorted_at)) d(kind, number, key, at)
          WHERE l.decision IS NOT NULL AND d.number IS NOT NULL ORDER BY d.at, d.number`,
          [await blob('certificate'), await blob('inspection-report')],
        );
        await client.query(`SELECT setval('certificate_numbers', (SELECT max(greatest(doc_serial, coalesce(cert_serial, 0))) FROM fill_lot))`);
        bar.increment((dispositions.rowCount ?? 0) + (documents.rowCount ?? 0));
      },
    ],
    [
      'switching history',
      async ({ client, bar, users }) => {
        const events = await client.query(
          `INSERT INTO switching_events (supplier_id, part_id, lot_id, before, after, explanation, created_at, kind, position, result, reduced_enabled, disposition_id, actor_id)
         SELECT supplier_id, part_id, lot_id, sw_before, sw_after, sw_explanation, signed_at, 'lot', sw_position,
                jsonb_build_object('accepted', decision = 'accept', 'defectives', defectives, 'plan', jsonb_build_object('aql', aql::float8, 'level', 'II', 'accept', accept,
                  'reject', reject, 'severity', sw_before->>'severity', 'planLetter', plan_letter, 'sampleSize', sample_size)),
                true, disposition_id, $1
           FROM fill_lot WHERE decision IS NOT NULL ORDER BY signed_at`,
          [users.quality],
        );
        const states = await client.query(
          `INSERT INTO switching_states (supplier_id, part_id, state, updated_at)
         SELECT DISTINCT ON (supplier_id, part_id) supplier_id, part_id, coalesce(sw_after, '{"stopped": false, "severity": "normal", "recentResults": [], "switchingScore": 0, "tightenedCount": 0, "consecutiveAccepted": 0}'), coalesce(signed_at, received_at)
           FROM fill_lot ORDER BY supplier_id, part_id, (sw_after IS NULL), n DESC`,
        );
        bar.increment((events.rowCount ?? 0) + (states.rowCount ?? 0));
      },
    ],
    // Moves in the order they happened, so each leaves a piece from where the one before put it.
    [
      'stock moves: receipts',
      byChunks(`
      INSERT INTO stock_moves (piece_id, from_location_id, to_location_id, reason, actor_id, moved_at)
      SELECT piece_id, NULL, (SELECT id FROM locations WHERE code = 'QUARANTINE'), 'receipt', (SELECT id FROM users WHERE email = 'clerk@phaselot.test'), received_at
        FROM fill_piece WHERE n >= $1 AND n < $2 ORDER BY piece_id`),
    ],
    ['stock moves: decisions', moves('decision')],
    ['stock moves: transfers', moves('transfer')],
    ['stock moves: issues', moves('issue')],
    [
      'audit trail',
      async (context) => {
        await collectAudit(context, docNumber);
        await insertAuditInChainOrder(context);
      },
    ],
  ];
}

const LOCATION_OF = `(CASE p.dest WHEN 'stock' THEN :stock WHEN 'review' THEN :review WHEN 'vendor' THEN :vendor END)`;
const TRANSFER_TO = '(CASE WHEN p.luck % 2 = 0 THEN :stock2 ELSE :stock3 END)';

/** The moves of one kind, in chunks of lots, with the locations of the demo site. */
function moves(kind: 'decision' | 'transfer' | 'issue') {
  return async (context: Context) => {
    const at = (sql: string) =>
      sql.replace(/:(quarantine|stock2|stock3|stock|review|vendor)\b/g, (_m, name: keyof Context['locations']) => String(context.locations[name]));
    const note = `CASE WHEN p.state = 'accepted' AND p.dest = 'stock' THEN 'lot L-' || p.lot_id || ' accepted'
                      WHEN p.state = 'accepted' THEN 'lot L-' || p.lot_id || ' accepted; this piece failed inspection, so to material review'
                      WHEN p.state = 'rejected' THEN 'lot L-' || p.lot_id || ' rejected to vendor'
                      WHEN p.dest = 'stock' THEN 'lot L-' || p.lot_id || ' sorted: conforming'
                      ELSE 'lot L-' || p.lot_id || ' sorted: nonconforming, back to the vendor' END`;
    const sql = {
      decision: `SELECT p.piece_id, :quarantine, ${LOCATION_OF}, CASE p.dest WHEN 'stock' THEN 'release' WHEN 'review' THEN 'hold' ELSE 'return-to-vendor' END, NULL, ${note},
                        ${context.users.quality}, CASE WHEN p.state = 'sorted' THEN p.sorted_at ELSE p.signed_at END
                   FROM fill_piece p WHERE p.dest IS NOT NULL`,
      transfer: `SELECT p.piece_id, :stock, ${TRANSFER_TO}, 'transfer', NULL, NULL, ${context.users.clerk}, p.signed_at + interval '5 days' FROM fill_piece p WHERE p.transferred`,
      issue: `SELECT p.piece_id, CASE WHEN p.transferred THEN ${TRANSFER_TO} ELSE :stock END, NULL, 'issue',
                     'WO-' || to_char(p.signed_at, 'YY') || '-' || lpad(((p.n / 40) % 10000)::text, 4, '0'), NULL, ${context.users.clerk},
                     coalesce(p.sorted_at, p.signed_at) + make_interval(days => 10 + p.luck) FROM fill_piece p WHERE p.issued`,
    }[kind];
    await byChunks(
      at(`
      INSERT INTO stock_moves (piece_id, from_location_id, to_location_id, reason, work_order, note, actor_id, moved_at)
      ${sql} AND p.n >= $1 AND p.n < $2 ORDER BY p.piece_id`),
    )(context);
  };
}

/** The audit events the history would have written, in a staging table, each with its time. */
async function collectAudit(context: Context, docNumber: (prefix: string, serial: string, at: string) => string) {
  const { client, users } = context;
  const codes = `(SELECT jsonb_object_agg(id, code) FROM locations)`;
  await client.query(`
    CREATE TEMP TABLE fill_audit (at timestamptz, actor_id int, action text, entity_type text, entity_id text, before jsonb, after jsonb);
    INSERT INTO fill_audit SELECT created_at, ${users.buyer}, 'supplier.create', 'supplier', id::text, NULL, jsonb_build_object('name', name, 'contactEmail', contact_email)
      FROM suppliers WHERE name LIKE 'Fill supplier %';
    INSERT INTO fill_audit SELECT created_at, ${users.buyer}, 'part.create', 'part', id::text, NULL, jsonb_build_object('number', number, 'description', description, 'spec', spec)
      FROM parts WHERE number LIKE 'FILL-%';
    INSERT INTO fill_audit SELECT po.created_at, ${users.buyer}, 'purchase-order.create', 'purchase-order', po.id::text, NULL,
           jsonb_build_object('number', po.number, 'supplierId', po.supplier_id, 'currency', po.currency,
             'lines', (SELECT jsonb_agg(jsonb_build_object('lineNumber', line_number, 'partId', part_id, 'quantity', quantity, 'unitPrice', unit_price, 'inspectionLevel', inspection_level, 'aql', aql)
                         ORDER BY line_number) FROM purchase_order_lines WHERE purchase_order_id = po.id))
      FROM purchase_orders po WHERE po.number LIKE 'FPO-%';
    INSERT INTO fill_audit SELECT l.received_at, ${users.clerk}, 'lot.receive', 'lot', l.lot_id::text, NULL,
           jsonb_build_object('line', l.line_number, 'quantity', l.quantity, 'supplierLot', 'FSL-' || lpad((l.n + 1)::text, 6, '0'), 'packingSlip', 'PS-F' || lpad((l.n + 1)::text, 6, '0'),
             'purchaseOrder', 'FPO-' || lpad((l.ord + 1)::text, 6, '0'), 'attachments', '[]'::jsonb, 'overReceiptReason', NULL,
             'serials', (SELECT jsonb_agg('F' || lpad((l.n + 1)::text, 6, '0') || '-' || lpad((i + 1)::text, 2, '0') ORDER BY i) FROM generate_series(0, l.quantity - 1) i),
             'sampling', jsonb_build_object('seed', l.seed, 'accept', l.accept, 'reject', l.reject, 'severity', l.severity, 'codeLetter', l.code_letter, 'planLetter', l.plan_letter, 'sampleSize', l.sample_size))
      FROM fill_lot l;
    INSERT INTO fill_audit SELECT f.uploaded_at, ${users.inspector}, 'measurement.upload', 'lot', f.lot_id::text, NULL,
           jsonb_build_object('fileId', f.id, 'name', f.original_name, 'sha256', f.sha256, 'pieces', f.row_count / 6, 'instrument', 'BENCH-2')
      FROM measurement_files f WHERE f.original_name ~ '^(bench|sort)-L' AND f.lot_id IN (SELECT lot_id FROM fill_lot);
    INSERT INTO fill_audit SELECT min(m.moved_at), min(m.actor_id), 'stock.' || m.reason, 'stock', NULL, NULL,
           jsonb_build_object('to', ${codes} ->> min(m.to_location_id)::text, 'workOrder', min(m.work_order), 'note', min(m.note),
             'pieces', jsonb_agg(jsonb_build_object('serial', p.serial, 'lot', p.lot_id, 'from', ${codes} ->> m.from_location_id::text) ORDER BY p.serial))
      FROM stock_moves m JOIN pieces p ON p.id = m.piece_id
     WHERE m.reason <> 'receipt' AND p.lot_id IN (SELECT lot_id FROM fill_lot)
     GROUP BY p.lot_id, m.reason, m.to_location_id, m.moved_at, m.note;
    INSERT INTO fill_audit SELECT l.signed_at, ${users.quality}, 'disposition.' || l.decision, 'lot', l.lot_id::text, jsonb_build_object('state', 'awaiting-disposition'),
           jsonb_build_object('dispositionId', l.disposition_id, 'decision', l.decision, 'meaning', d.meaning, 'deviationNumber', NULL, 'note', d.justification,
             'pieces', CASE l.decision WHEN 'accept' THEN l.quantity || ' pieces released to stock (measured conforming, or released under the sampling plan)'
                                       WHEN 'reject' THEN l.quantity || ' pieces to return-to-vendor'
                                       ELSE l.quantity || ' pieces held in quarantine to be measured one by one (100 % sort)' END,
             'documents', CASE WHEN l.decision = 'accept' THEN jsonb_build_array(${docNumber('PLC', 'l.doc_serial', 'l.signed_at')}, ${docNumber('PLR', 'l.doc_serial', 'l.signed_at')})
                               ELSE jsonb_build_array(${docNumber('PLR', 'l.doc_serial', 'l.signed_at')}) END)
      FROM fill_lot l JOIN dispositions d ON d.id = l.disposition_id;
    INSERT INTO fill_audit SELECT l.sorted_at, ${users.inspector}, 'disposition.sort-completed', 'lot', l.lot_id::text, jsonb_build_object('state', 'sorting'),
           jsonb_build_object('state', 'sorted', 'dispositionId', l.disposition_id,
             'released', (SELECT count(*) FROM pieces p WHERE p.lot_id = l.lot_id AND p.state IN ('in-stock', 'issued')),
             'returned', (SELECT count(*) FROM pieces p WHERE p.lot_id = l.lot_id AND p.state = 'returned'),
             'documents', CASE WHEN l.cert_serial IS NOT NULL THEN jsonb_build_array(${docNumber('PLC', 'l.cert_serial', 'l.sorted_at')}) ELSE '[]'::jsonb END)
      FROM fill_lot l WHERE l.state = 'sorted';
    INSERT INTO fill_audit SELECT l.signed_at, ${users.quality}, 'switching.change', 'switching', l.supplier_id || '/' || l.part_id, l.sw_before,
           jsonb_build_object('state', l.sw_after, 'lotId', l.lot_id, 'explanation', l.sw_explanation)
      FROM fill_lot l WHERE l.sw_changed;
  `);
}

/** Appends the staged events to the trail oldest first, in batches; the chain trigger links each. */
async function insertAuditInChainOrder({ client, bar }: Context) {
  await client.query(`
    CREATE TEMP TABLE fill_audit_ordered AS SELECT row_number() OVER (ORDER BY at, action, entity_id) AS k, a.* FROM fill_audit a;
    CREATE UNIQUE INDEX ON fill_audit_ordered (k);`);
  const total = Number((await client.query('SELECT count(*) AS n FROM fill_audit_ordered')).rows[0].n);
  // The estimate made at the start is known exactly now: the bar ends at 100 % instead of passing it.
  // (`value` is the bar's count so far, the {value} of its format; its typings leave it out.)
  bar.setTotal((bar as SingleBar & { value: number }).value + total);
  for (let from = 0; from < total; from += AUDIT_BATCH) {
    const result = await client.query(
      `INSERT INTO audit_events (occurred_at, actor_id, actor_email, actor_roles, action, entity_type, entity_id, before, after)
       SELECT a.at, a.actor_id, u.email, u.roles, a.action, a.entity_type, a.entity_id, a.before, a.after
         FROM fill_audit_ordered a JOIN users u ON u.id = a.actor_id WHERE a.k > $1 AND a.k <= $2 ORDER BY a.k`,
      [from, from + AUDIT_BATCH],
    );
    bar.increment(result.rowCount ?? 0);
    if ((from / AUDIT_BATCH) % VACUUM_HEAD_EVERY === VACUUM_HEAD_EVERY - 1) await client.query('VACUUM audit_chain_head');
  }
}

/** Sequences past the explicit ids, then vacuum and statistics, as a database that has run for years would have. */
async function finish(client: pg.Client, base: Ids) {
  for (const table of Object.keys(base)) {
    await client.query(`SELECT setval(pg_get_serial_sequence('${table}', 'id'), (SELECT max(id) FROM ${table}))`);
  }
  await client.query('VACUUM (ANALYZE)');
}

const describeScale = () =>
  `${SCALE.lots.toLocaleString('en-GB')} lots on ${ORDERS.toLocaleString('en-GB')} orders from ${SCALE.suppliers} suppliers of ${SCALE.parts} parts, ` +
  `received ${new Date(SCALE.first).toISOString().slice(0, 10)} to ${new Date(SCALE.last).toISOString().slice(0, 10)}, level II at AQL ${[0, 1, 2, 3].map(aqlOfPart).join('/')} by part`;
