// What /api/health answers: whether this process reaches its database.
import { databaseIsUp } from '../../db';

export async function healthReport() {
  const up = await databaseIsUp();
  return { status: up ? 200 : 503, body: { status: up ? 'ok' : 'degraded', db: up ? 'ok' : 'down' } };
}
