import { describe, expect, it } from 'vitest';
import { as } from '../../../tests/helpers/api';

describe('/api/settings', () => {
  it('lets the admin change the site settings and everyone read them', async () => {
    const admin = await as('admin');
    const before = (await admin.get('/api/settings').expect(200)).body;
    const saved = await admin
      .put('/api/settings')
      .send({ ...before, reducedInspectionEnabled: !before.reducedInspectionEnabled })
      .expect(200);
    expect(saved.body.reducedInspectionEnabled).toBe(!before.reducedInspectionEnabled);
    expect((await (await as('inspector')).get('/api/settings').expect(200)).body).toEqual(saved.body);
    await admin.put('/api/settings').send(before).expect(200);
  });

  it('keeps the calibration reminder days as whole days, largest first, each once', async () => {
    const admin = await as('admin');
    const before = (await admin.get('/api/settings').expect(200)).body;
    expect(before.calibrationReminderDays).toEqual([30, 7]);
    const saved = await admin
      .put('/api/settings')
      .send({ ...before, calibrationReminderDays: '7, 30 7' })
      .expect(200);
    expect(saved.body.calibrationReminderDays).toEqual([30, 7]);
    const bad = await admin
      .put('/api/settings')
      .send({ ...before, calibrationReminderDays: [0, 2.5] })
      .expect(400);
    expect(bad.body.error.details).toEqual([{ path: 'calibrationReminderDays', message: 'Whole numbers of days from 1 to 365, such as 30, 7' }]);
    await admin.put('/api/settings').send(before).expect(200);
  });

  it('is changed by admins only, with validated fields', async () => {
    await (await as('quality')).put('/api/settings').send({ siteName: 'X', reducedInspectionEnabled: true }).expect(403);
    const bad = await (await as('admin')).put('/api/settings').send({ siteName: '' }).expect(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['reducedInspectionEnabled', 'siteName']);
  });
});
