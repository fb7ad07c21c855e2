import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { app, as, freshUser } from '../../../tests/helpers/api';
import { ROLES } from '../../../shared/schemas/roles';

describe('/api/users', () => {
  it('lets an admin list, create, change roles of and deactivate users', async () => {
    const admin = await as('admin');
    const created = await admin
      .post('/api/users')
      .send({ email: 'Tamsin.Okonjo@Example.test', name: 'Tamsin Okonjo', password: 'long-enough-password', roles: ['clerk', 'inspector'] })
      .expect(201);
    expect(created.body).toMatchObject({ email: 'tamsin.okonjo@example.test', roles: ['clerk', 'inspector'], active: true });
    expect(created.body).not.toHaveProperty('passwordHash');

    const listed = await admin.get('/api/users').expect(200);
    expect(listed.body.data.some((u: { email: string }) => u.email === 'tamsin.okonjo@example.test')).toBe(true);

    const changed = await admin
      .patch(`/api/users/${created.body.id}`)
      .send({ roles: ['quality'], active: false })
      .expect(200);
    expect(changed.body).toMatchObject({ roles: ['quality'], active: false });
    await request(app).post('/api/auth/login').send({ email: 'tamsin.okonjo@example.test', password: 'long-enough-password' }).expect(401);
  });

  it('refuses a duplicate e-mail with 409 and bad fields with 400', async () => {
    const admin = await as('admin');
    const dup = await admin
      .post('/api/users')
      .send({ email: 'clerk@phaselot.test', name: 'Dup', password: 'long-enough-password', roles: ['clerk'] })
      .expect(409);
    expect(dup.body.error.code).toBe('duplicate');
    const bad = await admin
      .post('/api/users')
      .send({ email: 'x@y.test', name: '', password: 'short', roles: ['wizard'] })
      .expect(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['name', 'password', 'roles.0']);
  });

  it('does not let an admin lock themself out', async () => {
    const { user, email, password } = await freshUser(['admin']);
    const { body } = await request(app).post('/api/auth/login').send({ email, password }).expect(200);
    const response = await request(app)
      .patch(`/api/users/${user.id}`)
      .set('Authorization', `Bearer ${body.token}`)
      .send({ roles: ['auditor'] })
      .expect(400);
    expect(response.body.error.message).toMatch(/cannot deactivate yourself or remove your own administrator role/);
  });

  it.each(ROLES.filter((r) => r !== 'admin'))('answers %s with 403', async (role) => {
    const client = await as(role);
    await client.get('/api/users').expect(403);
    await client
      .post('/api/users')
      .send({ email: 'z@z.test', name: 'Z', password: 'long-enough-password', roles: ['clerk'] })
      .expect(403);
  });

  it('answers 401 without sign-in', async () => {
    await request(app).get('/api/users').expect(401);
  });
});
