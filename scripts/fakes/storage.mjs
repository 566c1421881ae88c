// S3-compatible storage fake on loopback (s3rver), for development and tests only.
import { parseArgs } from 'node:util';
import S3rver from 's3rver';

const { values } = parseArgs({ options: { port: { type: 'string' }, dir: { type: 'string' }, bucket: { type: 'string' } } });
// The client fetches meshes straight from presigned URLs on another origin, so the bucket allows CORS reads
// (a real S3 bucket needs the same rule; see README).
const CORS = `<CORSConfiguration><CORSRule><AllowedOrigin>*</AllowedOrigin><AllowedMethod>GET</AllowedMethod>
<AllowedMethod>HEAD</AllowedMethod><AllowedMethod>PUT</AllowedMethod><AllowedHeader>*</AllowedHeader>
<ExposeHeader>ETag</ExposeHeader><ExposeHeader>Content-Length</ExposeHeader><MaxAgeSeconds>3000</MaxAgeSeconds></CORSRule></CORSConfiguration>`;
const server = new S3rver({
  address: '127.0.0.1',
  port: Number(values.port),
  directory: values.dir,
  silent: true,
  configureBuckets: [{ name: values.bucket, configs: [CORS] }],
});
await server.run();
console.log(`storage fake listening on 127.0.0.1:${values.port}, bucket ${values.bucket}`);
const stop = async () => { await server.close(); process.exit(0); };
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
