import { describe, expect, it } from 'vitest';
import { as } from '../../../tests/helpers/api';
import { uniqueTag } from '../../../tests/helpers/purchasing';

describe('/api/suppliers', () => {
  it('lets the buyer create and edit a supplier, owned by the buyer unless another buyer is named', async () => {
    const buyer = await as('buyer');
    const tag = uniqueTag();
    const created = await buyer
      .post('/api/suppliers')
      .send({ name: `Fenwick Crystal ${tag}`, contactEmail: 'Orders@Fenwick.Example' })
      .expect(201);
    expect(created.body).toMatchObject({ name: `Fenwick Crystal ${tag}`, contactEmail: 'orders@fenwick.example', active: true, openOrders: 0 });
    expect(created.body.owner.name).toBeTruthy();

    const edited = await buyer
      .put(`/api/suppliers/${created.body.id}`)
      .send({ name: `Fenwick Crystal ${tag}`, contactEmail: 'po@fenwick.example', notes: 'Moved to a new desk', active: false })
      .expect(200);
    expect(edited.body).toMatchObject({ contactEmail: 'po@fenwick.example', notes: 'Moved to a new desk', active: false, owner: created.body.owner });
  });

  it('refuses a non-buyer as owner, a bad e-mail and a duplicate name', async () => {
    const buyer = await as('buyer');
    const clerkId = (await (await as('clerk')).get('/api/auth/me').expect(200)).body.user.id;
    const owner = await buyer
      .post('/api/suppliers')
      .send({ name: `Owner test ${uniqueTag()}`, contactEmail: 'a@b.example', ownerId: clerkId })
      .expect(400);
    expect(owner.body.error.message).toBe('The owner of a supplier must be an active buyer');
    const email = await buyer.post('/api/suppliers').send({ name: 'Anything', contactEmail: 'not-an-address' }).expect(400);
    expect(email.body.error.details).toEqual([{ path: 'contactEmail', message: 'Enter a valid e-mail address' }]);
    await buyer.post('/api/suppliers').send({ name: 'Quillmere Crystal Foundry', contactEmail: 'x@y.example' }).expect(409);
  });

  it('pages, sorts only by whitelisted columns, searches and exports what the filter shows', async () => {
    const buyer = await as('buyer');
    const tag = uniqueTag();
    await buyer
      .post('/api/suppliers')
      .send({ name: `=HYPERLINK("http://x.example") ${tag}`, contactEmail: 'formula@x.example' })
      .expect(201);
    await buyer
      .post('/api/suppliers')
      .send({ name: `Plain ${tag}`, contactEmail: 'plain@x.example' })
      .expect(201);

    const page = await buyer.get('/api/suppliers?pageSize=2&page=1&sort=-name').expect(200);
    expect(page.body.data).toHaveLength(2);
    expect(page.body.total).toBeGreaterThanOrEqual(6);
    const names = page.body.data.map((s: { name: string }) => s.name);
    expect([...names].sort().reverse()).toEqual(names);

    const bad = await buyer.get('/api/suppliers?sort=password_hash').expect(400);
    expect(bad.body.error.message).toMatch(/^Cannot sort by "password_hash"; sort by one of: name, contactEmail/);

    const found = await buyer.get(`/api/suppliers?q=${tag}`).expect(200);
    expect(found.body.total).toBe(2);

    const csv = await buyer.get(`/api/suppliers?q=${tag}&format=csv`).expect(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    const lines = csv.text
      .replace(/^\uFEFF/, '')
      .trim()
      .split('\n');
    expect(lines[0]).toBe('name,contact_email,owner,open_orders,active,notes');
    expect(lines).toHaveLength(3);
    expect(lines[1]).toMatch(/^"'=HYPERLINK\(""http:\/\/x\.example""\)/);
    const alias = await buyer.get(`/api/suppliers/export.csv?q=${tag}`).expect(200);
    expect(alias.text).toBe(csv.text);
  });
});
