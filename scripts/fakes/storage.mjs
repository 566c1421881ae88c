// S3-compatible storage fake on loopback (s3rver), for development and tests only.
import { readdir, readFile, rm, stat } from 'node:fs/promises';
import path from 'node:path';
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

// s3rver 3.7 answers AbortMultipartUpload (DELETE ?uploadId=) with 405 and ListMultipartUploads (GET ?uploads)
// with 501, so the parts of every aborted upload stayed on disk for good (510 MB after one oversize upload).
// The two calls are answered here, before s3rver, from its own folder layout: <dir>/<bucket>/._S3rver_uploads/<id>/.
const uploadsDir = (bucket) => path.join(values.dir, bucket, '._S3rver_uploads');
const xml = (s) => String(s).replace(/[<>&'"]/g, (c) => `&#${c.charCodeAt(0)};`);
async function listUploads(bucket) {
  const ids = await readdir(uploadsDir(bucket)).catch(() => []);
  const out = [];
  for (const id of ids) {
    const dir = path.join(uploadsDir(bucket), id);
    const key = await readFile(path.join(dir, 'key'), 'utf8').catch(() => null);
    if (key === null) continue;
    out.push({ id, key, initiated: (await stat(dir)).mtime });
  }
  return out;
}
async function extraRoutes(req, res) {
  const url = new URL(req.url, 'http://fake');
  const [, bucket, ...rest] = url.pathname.split('/');
  if (!bucket || bucket !== values.bucket) return false;
  if (req.method === 'DELETE' && rest.length && url.searchParams.has('uploadId')) {
    const id = url.searchParams.get('uploadId');
    if (!/^[\w-]+$/.test(id)) return false;
    await rm(path.join(uploadsDir(bucket), id), { recursive: true, force: true });
    res.writeHead(204).end();
    return true;
  }
  if (req.method === 'GET' && !rest.join('') && url.searchParams.has('uploads')) {
    const prefix = url.searchParams.get('prefix') ?? '';
    const items = (await listUploads(bucket)).filter((u) => u.key.startsWith(prefix));
    const body = `<?xml version="1.0" encoding="UTF-8"?><ListMultipartUploadsResult xmlns="http://s3.amazonaws.com/doc/2006-03-01/">`
      + `<Bucket>${xml(bucket)}</Bucket><Prefix>${xml(prefix)}</Prefix><IsTruncated>false</IsTruncated>`
      + items.map((u) => `<Upload><Key>${xml(u.key)}</Key><UploadId>${xml(u.id)}</UploadId><Initiated>${u.initiated.toISOString()}</Initiated></Upload>`).join('')
      + `</ListMultipartUploadsResult>`;
    res.writeHead(200, { 'content-type': 'application/xml' }).end(body);
    return true;
  }
  return false;
}
const s3rverCallback = server.callback.bind(server);
server.callback = () => {
  const inner = s3rverCallback();
  return (req, res) => {
    extraRoutes(req, res).then((done) => { if (!done) inner(req, res); }, (err) => { res.writeHead(500).end(String(err.message)); });
  };
};

await server.run();
console.log(`storage fake listening on 127.0.0.1:${values.port}, bucket ${values.bucket}`);
const stop = async () => { await server.close(); process.exit(0); };
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
