import { describe, expect, it, vi } from 'vitest';
import request from 'supertest';
import { app } from '../../../tests/helpers/api';
import { sequelize } from '../../../db';

describe('GET /api/health', () => {
  it('reports the database up', async () => {
    const response = await request(app).get('/api/health').expect(200);
    expect(response.body).toEqual({ status: 'ok', db: 'ok' });
  });

  it('answers 503 with db "down" when the database does not answer', async () => {
    const spy = vi.spyOn(sequelize, 'query').mockRejectedValueOnce(new Error('connection refused'));
    const response = await request(app).get('/api/health').expect(503);
    expect(response.body.db).toBe('down');
    spy.mockRestore();
  });

  it('answers unknown API routes with a JSON 404', async () => {
    const response = await request(app).get('/api/no-such-thing').expect(404);
    expect(response.body.error.code).toBe('not_found');
  });
});
