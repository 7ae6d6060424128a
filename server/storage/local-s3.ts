/**
 * The local fake S3 server (@20minutes/s3rver, bound to 127.0.0.1): with no bucket configured the
 * app keeps its files through the real S3 API in this server, whose objects live under
 * DATA_DIR/objects, as the local SMTP server does for mail. It is for one machine; teams that run
 * several app instances set S3_URL / S3_BUCKET to a shared store instead.
 */
import type { AddressInfo } from 'node:net';
import S3rver from '@20minutes/s3rver';

export interface LocalS3 {
  /** http://127.0.0.1:<port> */
  endpoint: string;
  close(): Promise<void>;
}

/** The key pair the fake server checks signatures with (its documented default; it guards nothing, the server listens on loopback only). */
export const LOCAL_S3_CREDENTIALS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' };

/** Starts the fake server on `port` (0 = a free one) with `bucket` made if missing. */
export async function startLocalS3({ dir, port = 0, bucket }: { dir: string; port?: number; bucket: string }): Promise<LocalS3> {
  const server = new S3rver({ address: '127.0.0.1', port, directory: dir, silent: true, configureBuckets: [{ name: bucket }], vhostBuckets: false });
  const address = (await server.run()) as AddressInfo;
  // Like the mail sink: never keep a finished process (a test file, a CLI) alive on its own.
  server.httpServer?.unref();
  return {
    endpoint: `http://127.0.0.1:${address.port}`,
    close: async () => {
      server.httpServer?.closeAllConnections?.();
      await server.close();
    },
  };
}
