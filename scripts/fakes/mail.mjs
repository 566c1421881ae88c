// SMTP fake on loopback: accepts every message and appends it, parsed, to an outbox file (JSON lines).
// STARTTLS and AUTH are off: smtp-server's built-in certificate has expired (stack notes).
import { appendFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';

const { values } = parseArgs({ options: { port: { type: 'string' }, outbox: { type: 'string' } } });
const server = new SMTPServer({
  secure: false,
  authOptional: true,
  disabledCommands: ['AUTH', 'STARTTLS'],
  logger: false,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((mail) => {
        const entry = {
          id: mail.messageId ?? `${Date.now()}`,
          receivedAt: new Date().toISOString(),
          from: mail.from?.text ?? '',
          to: (session.envelope.rcptTo ?? []).map((r) => r.address),
          subject: mail.subject ?? '',
          text: mail.text ?? '',
          html: typeof mail.html === 'string' ? mail.html : '',
        };
        appendFileSync(values.outbox, `${JSON.stringify(entry)}\n`);
        callback();
      })
      .catch((err) => callback(err));
  },
});
server.on('error', (err) => console.error(`mail fake: ${err.message}`));
server.listen(Number(values.port), '127.0.0.1', () => console.log(`mail fake listening on 127.0.0.1:${values.port}`));
const stop = () => server.close(() => process.exit(0));
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
