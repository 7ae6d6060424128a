/**
 * Stored files (attachments) through the S3 API (@aws-sdk/client-s3), so any S3-compatible store
 * serves: with S3_URL (an endpoint such as http://minio:9000, addressed path-style) and/or
 * S3_BUCKET the files go to that bucket with the usual AWS_ACCESS_KEY_ID / AWS_SECRET_ACCESS_KEY /
 * AWS_REGION (or any other credential source the SDK reads); with neither, the app starts the
 * local fake S3 server (local-s3.ts) with its files under DATA_DIR/objects.
 */
import path from 'node:path';
import type { Readable } from 'node:stream';
import { DeleteObjectCommand, GetObjectCommand, ListObjectsV2Command, PutObjectCommand, S3Client, S3ServiceException } from '@aws-sdk/client-s3';
import type { Config } from '../config.ts';
import { LOCAL_S3_CREDENTIALS, startLocalS3, type LocalS3 } from './local-s3.ts';

// The pinned SDK runs on Node 20 (package.json engines); its start-up warning speaks of releases
// after January 2027, which this project does not take without a Node upgrade.
process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true';

export interface StoredObject {
  body: Readable;
  size: number | undefined;
}

export interface ObjectStore {
  /** Writes `body` under `key` (replacing what was there). */
  put(key: string, body: Buffer, contentType: string): Promise<void>;
  /** The object's bytes as a stream, or null when there is no such key. */
  get(key: string): Promise<StoredObject | null>;
  /** Removes `key` (no error when it is already gone). */
  delete(key: string): Promise<void>;
  /** Resolves when the bucket answers (a one-key listing: HeadBucket is missing from the local fake server); rejects otherwise. */
  ping(timeoutMs?: number): Promise<void>;
  /** Starts the local fake server now (when no bucket is configured) and says where files go. */
  start(): Promise<{ endpoint: string; bucket: string; local: boolean }>;
  /** Stops the local fake server, if started. */
  close(): Promise<void>;
}

export interface ObjectStoreOptions {
  /** S3_URL: the endpoint of an S3-compatible store; unset with a bucket set means AWS S3 itself. */
  s3Url?: string;
  /** S3_BUCKET (default "wyeward"). */
  bucket?: string;
  /** Use the local fake server (no S3_URL and no S3_BUCKET). */
  local: boolean;
  /** Folder of the local fake server's files (DATA_DIR/objects). */
  localDir: string;
  /** Port of the local fake server (S3_LOCAL_PORT; 0 = a free port). */
  localPort?: number;
  /** Region of the bucket (AWS_REGION). */
  region?: string;
  /** Keys (AWS_ACCESS_KEY_ID, AWS_SECRET_ACCESS_KEY); unset, the SDK's default sources. */
  credentials?: { accessKeyId: string; secretAccessKey: string; sessionToken?: string };
}

/** The error an unreachable or failing store becomes: the request is answered 503 in words. */
export class ObjectStoreError extends Error {
  override name = 'ObjectStoreError';
}

function isMissing(err: unknown): boolean {
  return err instanceof S3ServiceException && (err.name === 'NoSuchKey' || err.name === 'NotFound' || err.$metadata?.httpStatusCode === 404);
}

/**
 * Path-style, the SDK addresses a bucket as "/<bucket>/" and signs that path; the fake server (and
 * some other S3-compatible stores) check the signature against "/<bucket>". Sending and signing
 * "/<bucket>", which S3 treats as the same resource, agrees with both.
 */
function bucketPathWithoutSlash(client: S3Client): S3Client {
  client.middlewareStack.add(
    (next) => async (args) => {
      const req = args.request as { path?: string };
      if (typeof req.path === 'string' && /^\/[^/]+\/$/.test(req.path)) req.path = req.path.slice(0, -1);
      return next(args);
    },
    { step: 'build', name: 'bucketPathWithoutSlash' },
  );
  return client;
}

/** Creates the store; the local fake server starts on first use (or on start()). */
export function createObjectStore({ s3Url, bucket = 'wyeward', local, localDir, localPort = 0, region = 'us-east-1', credentials }: ObjectStoreOptions): ObjectStore {
  let localServer: Promise<LocalS3> | null = null;
  let client: Promise<S3Client> | null = null;

  function getClient(): Promise<S3Client> {
    client ??= (async () => {
      const common = { maxAttempts: 3, requestHandler: { connectionTimeout: 5_000, requestTimeout: 60_000 } } as const;
      if (!local) {
        // Keys from the configuration (AWS_* variables), else the SDK's own sources (profiles, instance roles).
        if (!s3Url) return new S3Client({ ...common, region, ...(credentials ? { credentials } : {}) });
        return bucketPathWithoutSlash(new S3Client({ ...common, endpoint: s3Url, forcePathStyle: true, region, ...(credentials ? { credentials } : {}) }));
      }
      localServer ??= startLocalS3({ dir: localDir, port: localPort, bucket });
      const s = await localServer;
      return bucketPathWithoutSlash(new S3Client({ ...common, endpoint: s.endpoint, forcePathStyle: true, region: 'us-east-1', credentials: LOCAL_S3_CREDENTIALS }));
    })();
    return client;
  }

  async function call<T>(what: string, fn: (c: S3Client) => Promise<T>): Promise<T> {
    try {
      return await fn(await getClient());
    } catch (err) {
      if (isMissing(err)) throw err;
      throw new ObjectStoreError(`${what} failed: ${err instanceof Error ? err.name : String(err)}`, { cause: err });
    }
  }

  return {
    async put(key, body, contentType) {
      await call('storing a file', (c) => c.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: body, ContentType: contentType, ContentLength: body.length })));
    },
    async get(key) {
      try {
        const out = await call('reading a file', (c) => c.send(new GetObjectCommand({ Bucket: bucket, Key: key })));
        return { body: out.Body as Readable, size: out.ContentLength };
      } catch (err) {
        if (isMissing(err)) return null;
        throw err;
      }
    },
    async delete(key) {
      try {
        await call('removing a file', (c) => c.send(new DeleteObjectCommand({ Bucket: bucket, Key: key })));
      } catch (err) {
        if (!isMissing(err)) throw err;
      }
    },
    async ping(timeoutMs = 3_000) {
      await call('reaching the bucket', (c) => c.send(new ListObjectsV2Command({ Bucket: bucket, MaxKeys: 1 }), { abortSignal: AbortSignal.timeout(timeoutMs) }));
    },
    async start() {
      await getClient();
      if (!local) return { endpoint: s3Url ?? 'AWS S3', bucket, local: false };
      return { endpoint: (await localServer!).endpoint, bucket, local: true };
    },
    async close() {
      const c = client;
      const s = localServer;
      client = null;
      localServer = null;
      if (c) (await c.catch(() => null))?.destroy();
      if (s) await (await s).close();
    },
  };
}

/** The store the configuration names (README "Running for a larger team"). */
export function objectStoreFor(config: Pick<Config, 's3Url' | 's3Bucket' | 's3Local' | 's3LocalPort' | 's3Region' | 's3Credentials' | 'dataDir'>): ObjectStore {
  return createObjectStore({
    s3Url: config.s3Url,
    bucket: config.s3Bucket,
    local: config.s3Local,
    localDir: path.join(config.dataDir, 'objects'),
    localPort: config.s3LocalPort,
    region: config.s3Region,
    credentials: config.s3Credentials,
  });
}

/** How long a good answer about the bucket is reused by `/api/health` (asked often by load balancers and benches). */
const BUCKET_CHECK_MS = 5_000;

/** The bucket's probe for `/api/health`: a listing of one key, a success reused for 5 s, a failure asked again next time. */
export function bucketHealthCheck(objects: ObjectStore): () => Promise<void> {
  let okAt = -Infinity;
  return async () => {
    if (Date.now() - okAt < BUCKET_CHECK_MS) return;
    await objects.ping();
    okAt = Date.now();
  };
}
