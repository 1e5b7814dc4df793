// The worker threads' entry (pool.ts): plain JavaScript, so Node loads it as it is; it teaches this
// thread TypeScript through tsx, then hands every job to tasks.ts.
import { register } from 'tsx/esm/api';

register();
const { default: handle } = await import('./tasks.ts');

export default handle;
