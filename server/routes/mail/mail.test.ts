import { describe, expect, it } from 'vitest';
import { as } from '../../../tests/helpers/api';
import { mailTransport } from '../../mail/transport';

describe('GET /api/mail/caught', () => {
  it('shows admins what the local catcher received, attachments included', async () => {
    const subject = `Catcher check ${Date.now()}`;
    await mailTransport.sendMail({
      from: 'phaselot@phaselot.test',
      to: 'buyer@phaselot.test',
      subject,
      text: 'Retardance 0.2493 λ, axis −0.31°',
      attachments: [{ filename: 'note.txt', content: 'hello' }],
    });
    const response = await (await as('admin')).get('/api/mail/caught').expect(200);
    const message = response.body.data.find((m: { subject: string }) => m.subject === subject);
    expect(message).toMatchObject({ to: 'buyer@phaselot.test', attachments: [{ filename: 'note.txt', size: 5 }] });
    expect(message.text).toContain('0.2493 λ');
  });

  it('is for admins only', async () => {
    await (await as('buyer')).get('/api/mail/caught').expect(403);
  });
});
