import { FilesystemStore } from './filesystem-store.js';
import { RedisStore } from './redis-store.js';
import type { Store, StoreConfig } from './store.js';

export function createStore(config: StoreConfig): Store {
  return config.kind === 'filesystem' ? new FilesystemStore(config.dataDir) : new RedisStore(config.url, config.prefix);
}
