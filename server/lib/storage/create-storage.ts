import type { Env } from '../../env';
import { LocalStorage } from './local-storage';
import { S3Storage } from './s3-storage';
import type { Storage } from './storage';
import { uploadTempDir } from './upload-temp';


type StorageEnv = Pick<Env, 'STORAGE_DRIVER' | 'STORAGE_DIR' | 'S3_ENDPOINT' | 'S3_BUCKET' | 'S3_REGION' | 'S3_ACCESS_KEY_ID' | 'S3_SECRET_ACCESS_KEY'>;

/** Builds the storage the configuration names: the local disk (default) or S3-compatible. */
export function createStorage(env: StorageEnv): Storage {
  if (env.STORAGE_DRIVER === 's3') {
    if (!env.S3_BUCKET) throw new Error('S3_BUCKET is required when STORAGE_DRIVER=s3');
    return new S3Storage({
      bucket: env.S3_BUCKET,
      endpoint: env.S3_ENDPOINT,
      region: env.S3_REGION,
      accessKeyId: env.S3_ACCESS_KEY_ID,
      secretAccessKey: env.S3_SECRET_ACCESS_KEY,
      tempDir: uploadTempDir(env),
    });
  }
  return new LocalStorage(env.STORAGE_DIR);
}

const byEnv = new WeakMap<object, Storage>();

/** One storage per configuration object, shared by the app and the start-up sweep. */
export function storageFor(env: StorageEnv): Storage {
  let s = byEnv.get(env);
  if (!s) {
    s = createStorage(env);
    byEnv.set(env, s);
  }
  return s;
}
