// The demo scenario: an invented instrument maker, Veltrane Optics Works, its people and its
// suppliers. Every name is invented; faker runs with a fixed seed so each seed run is the same.
import { faker } from '@faker-js/faker';
import { sequelize } from '..';
import { Instrument, User } from '../models';
import { seedInspectionDemo } from './inspectionDemo';
import { seedPerformanceHistory } from './performanceDemo';
import { seedReceivingDemo, seedStockDemo } from './receivingDemo';
import { seedNonconformanceDemo } from './nonconformanceDemo';
import { seedCorrectiveActionDemo } from './supplierQualityDemo';
import { ROLES, type Role } from '../../shared/schemas/roles';
import type { InstrumentInput } from '../../shared/schemas/instruments';
import { actorFromUser } from '../../server/audit/record';
import { recordCalibration } from '../../server/instruments/calibrations';
import { registerInstrument } from '../../server/instruments/instruments';
import { hashPassword } from '../../server/auth/passwords';

export const DEMO_PASSWORD = 'phaselot-demo';
export const DEMO_DOMAIN = 'phaselot.test';
export const DEMO_SITE_NAME = 'Veltrane Optics Works';

export const demoLogin = (role: Role) => ({ email: `${role}@${DEMO_DOMAIN}`, password: DEMO_PASSWORD });

async function seedUsers() {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const users: Partial<Record<Role, User>> = {};
  for (const role of ROLES) {
    users[role] = await User.create({
      email: demoLogin(role).email,
      name: `${faker.person.firstName()} ${faker.person.lastName()}`,
      roles: [role],
      passwordHash,
    });
  }
  return users as Record<Role, User>;
}

const daysFromSeed = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

/** The inspection bench of the demo site; one instrument is past its calibration date on purpose. */
async function seedInstruments(quality: User) {
  const rows: InstrumentInput[] = [
    {
      code: 'BENCH-2',
      kind: 'stokes-polarimeter',
      description: 'Six-state Stokes polarimeter, 632.8 nm and 1064 nm sources',
      uncertaintyWaves: 0.0008,
      uncertaintyDeg: 0.05,
      calibratedOn: '2026-05-12',
      calibrationDueOn: '2027-05-12',
    },
    {
      code: 'BENCH-1',
      kind: 'rotating-plate',
      description: 'Rotating-plate bench between fixed polarisers; exports angles clockwise',
      angleSign: -1,
      uncertaintyWaves: 0.0015,
      uncertaintyDeg: 0.1,
      // Due three weeks after the day the demo is seeded, whenever that is: quality's dashboard and the
      // calibration reminders always have one coming due.
      calibratedOn: daysFromSeed(-344),
      calibrationDueOn: daysFromSeed(21),
    },
    {
      code: 'RM-3',
      kind: 'direct-retardance',
      description: 'Direct-reading retardance meter, 400–1100 nm',
      s3Sign: -1,
      uncertaintyWaves: 0.001,
      uncertaintyDeg: 0.08,
      calibratedOn: '2026-08-20',
      calibrationDueOn: '2027-08-20',
    },
    {
      code: 'BENCH-0',
      kind: 'stokes-polarimeter',
      description: 'Retired bench, calibration lapsed',
      uncertaintyWaves: 0.002,
      uncertaintyDeg: 0.2,
      calibratedOn: '2024-09-01',
      calibrationDueOn: '2025-09-01',
      active: false,
    },
  ];
  const actor = actorFromUser(quality);
  const instruments: Instrument[] = [];
  for (const row of rows) instruments.push(await registerInstrument(actor, row, 'Oskarvale Metrology Laboratory'));
  // BENCH-2's history: the calibration before the current one.
  await recordCalibration(actor, instruments[0].id, {
    calibratedOn: '2025-05-09',
    dueOn: '2026-05-12',
    performedBy: 'Oskarvale Metrology Laboratory',
    certificateNumber: 'OML-25-0418',
    uncertaintyRetardance: 0.0009,
    uncertaintyRetardanceUnit: 'waves',
    uncertaintyAngleDeg: 0.05,
    uncertaintyNote: 'Expanded uncertainty, k = 2, at 632.8 nm',
  });
  return instruments;
}

export async function isDatabaseEmpty() {
  return (await User.count()) === 0;
}

/** Seeds the whole scenario. Later parts of the product add their steps after the users. */
export async function seedDemo() {
  faker.seed(4870);
  const users = await seedUsers();
  const instruments = await seedInstruments(users.quality);
  await sequelize.query(`INSERT INTO site_settings (id, value) VALUES (1, :value::jsonb)`, {
    replacements: { value: JSON.stringify({ siteName: DEMO_SITE_NAME, reducedInspectionEnabled: true }) },
  });
  const { locations, suppliers, parts, purchaseOrders, lots } = await seedReceivingDemo(users);
  // Inspection runs last: it takes lots received above through upload and signature.
  const inspected = await seedInspectionDemo(DEMO_PASSWORD);
  await seedStockDemo(users, lots);
  // The NCRs inspection opened, dispositioned, shipped back and a replacement received.
  await seedNonconformanceDemo(DEMO_PASSWORD);
  // Corrective-action requests raised from those NCRs, one answered by its supplier.
  await seedCorrectiveActionDemo();
  // Months of earlier deliveries for the supplier-performance charts, after the current lots.
  await seedPerformanceHistory(DEMO_PASSWORD);
  return { users, instruments, locations, suppliers, parts, purchaseOrders, lots, inspected };
}
