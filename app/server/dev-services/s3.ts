import { mkdir } from "node:fs/promises";
import { resolve } from "node:path";
import S3rver from "s3rver";

export interface StartS3Options {
  /** Folder holding the buckets and objects; kept between runs. */
  dir: string;
  /** TCP port on 127.0.0.1. */
  port: number;
  /** Buckets created at start when missing (existing ones and their objects are kept). */
  buckets: string[];
}

export interface RunningS3 {
  /** `http://127.0.0.1:PORT`; clients need `forcePathStyle: true`. */
  endpoint: string;
  stop(): Promise<void>;
}

/**
 * Starts the local S3 stand-in (s3rver) on 127.0.0.1:`port`, silent, with its data under `dir`,
 * and creates `buckets`. Any credentials are accepted; the app's defaults are S3RVER / S3RVER.
 */
export async function startS3(opts: StartS3Options): Promise<RunningS3> {
  const directory = resolve(opts.dir);
  await mkdir(directory, { recursive: true });
  const server = new S3rver({
    address: "127.0.0.1",
    port: opts.port,
    silent: true,
    directory,
    configureBuckets: opts.buckets.map((name) => ({ name, configs: [] })),
  });
  const address = await server.run();
  let stopping: Promise<void> | undefined;
  return {
    endpoint: `http://127.0.0.1:${address.port}`,
    stop() {
      stopping ??= server.close();
      return stopping;
    },
  };
}
