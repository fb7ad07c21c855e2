import { describe, expect, it } from 'vitest';
import { as } from '../../../tests/helpers/api';
import { orderedLine, uniqueTag } from '../../../tests/helpers/purchasing';
import { QUARTER_WAVE_633 } from '../../../tests/helpers/receivedLot';

describe('/api/parts', () => {
  it('keeps the specification a PO line was ordered with when the part is edited later', async () => {
    const buyer = await as('buyer');
    const { partId, order } = await orderedLine(10);
    const part = await buyer.get(`/api/parts/${partId}`).expect(200);
    await buyer
      .put(`/api/parts/${partId}`)
      .send({ ...part.body, spec: { ...QUARTER_WAVE_633, retardanceTolWaves: 0.01 } })
      .expect(200);

    const edited = await buyer.get(`/api/parts/${partId}`).expect(200);
    expect(edited.body.spec.retardanceTolWaves).toBe(0.01);
    const po = await buyer.get(`/api/purchase-orders/${order.id}`).expect(200);
    expect(po.body.lines[0].spec.retardanceTolWaves).toBe(0.003);
  });

  it('checks the specification field by field and drops what the construction does not use', async () => {
    const buyer = await as('buyer');
    const multi = await buyer
      .post('/api/parts')
      .send({ number: `MO-${uniqueTag()}`, description: 'Multi-order', spec: { ...QUARTER_WAVE_633, construction: 'multi-order' } })
      .expect(400);
    expect(multi.body.error.details).toEqual([{ path: 'spec.multiOrder', message: 'A multi-order plate needs its order' }]);

    const achromatic = await buyer
      .post('/api/parts')
      .send({
        number: `ACH-${uniqueTag()}`,
        description: 'Achromatic',
        spec: { ...QUARTER_WAVE_633, construction: 'achromatic', bandNm: [900, 500], clearApertureMm: 30 },
      })
      .expect(400);
    expect(achromatic.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['spec.bandNm.1', 'spec.clearApertureMm']);

    const zero = await buyer
      .post('/api/parts')
      .send({ number: `Z-${uniqueTag()}`, description: 'Zero-order', spec: { ...QUARTER_WAVE_633, multiOrder: 7, bandNm: [400, 800], maxDiattenuation: '' } })
      .expect(201);
    expect(zero.body.spec).not.toHaveProperty('multiOrder');
    expect(zero.body.spec).not.toHaveProperty('bandNm');
    expect(zero.body.spec).not.toHaveProperty('maxDiattenuation');
  });

  it('does not let the clerk create or edit a part', async () => {
    const clerk = await as('clerk');
    const { partId } = await orderedLine(5);
    const part = (await clerk.get(`/api/parts/${partId}`).expect(200)).body;
    await clerk
      .put(`/api/parts/${partId}`)
      .send({ ...part, description: 'Changed by the dock' })
      .expect(403);
    await clerk
      .post('/api/parts')
      .send({ ...part, number: `C-${uniqueTag()}` })
      .expect(403);
    expect((await clerk.get(`/api/parts/${partId}`).expect(200)).body.description).toBe(part.description);
  });

  it('sorts by the specification and filters by search', async () => {
    const buyer = await as('buyer');
    const list = await buyer.get('/api/parts?sort=-designWavelengthNm&q=VW-').expect(200);
    const wavelengths = list.body.data.map((p: { spec: { designWavelengthNm: number } }) => p.spec.designWavelengthNm);
    expect(wavelengths.length).toBeGreaterThanOrEqual(5);
    expect([...wavelengths].sort((a, b) => b - a)).toEqual(wavelengths);
  });
});
