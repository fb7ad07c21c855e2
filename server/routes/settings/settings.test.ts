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

  it('is changed by admins only, with validated fields', async () => {
    await (await as('quality')).put('/api/settings').send({ siteName: 'X', reducedInspectionEnabled: true }).expect(403);
    const bad = await (await as('admin')).put('/api/settings').send({ siteName: '' }).expect(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['reducedInspectionEnabled', 'siteName']);
  });
});
