// The inspection part of the demo: some of the lots the receiving seed left in quarantine are taken
// through the real operations (upload of invented bench files, signed decisions), so the demo has
// lots in every state, results to chart, certificates to verify and a rejection mail to read.
import { User } from '../models';
import { signDisposition } from '../../server/inspection/disposition';
import { evaluateLot } from '../../server/inspection/evaluation';
import { lotForInspection, lotsAwaitingInspection, type LotForInspection } from '../../server/inspection/lotAccess';
import { commitMeasurements } from '../../server/inspection/measurements';
import { actorFromUser } from '../../server/audit/record';
import { stokesBenchFile } from './benchFiles';
import { seedApprovedDeviation, seedPendingDeviation } from './supplierQualityDemo';

type Plan = 'accept' | 'reject' | 'awaiting' | 'partial' | 'deviation' | 'sort';

function benchFileFor(lot: LotForInspection, serials: string[], failing: Set<string>, seed: number) {
  const whole = lot.spec.construction === 'multi-order' ? (lot.spec.multiOrder ?? 0) : 0;
  const wavelengths =
    lot.spec.construction === 'achromatic' && lot.spec.bandNm
      ? [lot.spec.bandNm[0], lot.spec.designWavelengthNm, lot.spec.bandNm[1]]
      : [lot.spec.designWavelengthNm];
  const plates = serials.flatMap((serial, i) =>
    wavelengths.map((wavelengthNm) => ({
      serial,
      wavelengthNm,
      // Conforming plates scatter well inside the tolerance; failing ones sit 1.6 tolerances out.
      retardanceWaves: whole + lot.spec.nominalWaves + (failing.has(serial) ? 1.6 : ((i % 7) - 3) / 10) * lot.spec.retardanceTolWaves,
      fastAxisDeg: (((i % 5) - 2) / 8) * lot.spec.axisTolDeg,
    })),
  );
  return Buffer.from(stokesBenchFile(plates, { instrument: 'BENCH-2', date: new Date().toISOString().slice(0, 10), operator: 'QC-07', seed }));
}

export async function seedInspectionDemo(password: string) {
  const inspector = await User.findOne({ where: { email: 'inspector@phaselot.test' } });
  const quality = await User.findOne({ where: { email: 'quality@phaselot.test' } });
  if (!inspector || !quality) return [];
  const lots = await lotsAwaitingInspection();
  const plans: Plan[] = ['accept', 'reject', 'awaiting', 'partial', 'deviation', 'sort'];
  const done: { lotId: number; plan: Plan }[] = [];
  for (const [index, plan] of plans.entries()) {
    const lot = lots[index];
    if (!lot) break;
    const sample = (await evaluateLot(lot)).samplePieces.map((p) => p.serial);
    const measured = plan === 'partial' ? sample.slice(0, Math.ceil(sample.length / 2)) : sample;
    const failing = new Set(plan === 'reject' || plan === 'sort' ? measured.slice(0, 4) : plan === 'deviation' ? measured.slice(0, 1) : []);
    const bench = { ...actorFromUser(inspector), id: inspector.id };
    await commitMeasurements(bench, lot.id, [{ originalname: `bench-L${lot.id}.csv`, buffer: benchFileFor(lot, measured, failing, lot.id) }]);
    if (plan === 'accept' || plan === 'reject' || plan === 'deviation' || plan === 'sort') {
      const verdict = (await evaluateLot(await lotForInspection(lot.id))).verdict;
      const decision = verdict.proposal === 'accept' ? 'accept' : plan === 'deviation' ? 'use-as-is' : plan === 'sort' ? 'sort' : 'reject';
      await signDisposition(quality, lot.id, {
        decision,
        password,
        meaningAcknowledged: true,
        expectedDispositionId: null,
        ...(decision === 'reject' && { justification: 'Retardance out of tolerance on several sample pieces.' }),
        ...(decision === 'sort' && {
          justification: 'The build needs these plates now: sort at our bench, return the nonconforming ones. Agreed with the supplier.',
        }),
        ...(decision === 'use-as-is' && {
          deviationId: (await seedApprovedDeviation(lot.supplier.id, lot.part.id, lot.pieces.length + 20, password)).id,
          justification: 'One plate 0.005 λ long; the alignment fixture it goes into tolerates ±0.01 λ. Agreed with engineering.',
        }),
      });
      if (decision === 'use-as-is') await seedPendingDeviation(lot.supplier.id, lot.part.id, password);
      // The 100 % sort: the rest of the lot measured on the bench, a few plates out of tolerance.
      if (decision === 'sort') {
        const rest = lot.pieces.map((p) => p.serial).filter((serial) => !sample.includes(serial));
        const outOfTolerance = new Set(rest.filter((_, i) => i % 23 === 7));
        await commitMeasurements(bench, lot.id, [{ originalname: `sort-L${lot.id}.csv`, buffer: benchFileFor(lot, rest, outOfTolerance, lot.id + 1) }]);
      }
    }
    done.push({ lotId: lot.id, plan });
  }
  return done;
}
